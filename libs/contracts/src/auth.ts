import { z } from 'zod';
import { firmDateSettingsSchema } from './firm';

// Sign-in, people, invitations and project access. The server validates requests with these and
// the client takes its types from them.

/** principal and engineer are the firm's staff; client is a contact of a client organisation. */
export const roleSchema = z.enum(['principal', 'engineer', 'client']);
export type Role = z.infer<typeof roleSchema>;

const id = z.uuid();
const orgRef = z.object({ id, name: z.string() });
const projectRef = z.object({ id, reference: z.string(), name: z.string() });

/** GET /api/me for a person with access. */
export const meGrantedSchema = z.object({
  access: z.literal('granted'),
  user: z.object({
    id,
    email: z.string(),
    displayName: z.string(),
    role: roleSchema,
    clientOrganisation: orgRef.nullable(),
  }),
  /** The firm's date language: every date on screen follows it. */
  firm: z.object({ id, name: z.string() }).extend(firmDateSettingsSchema.shape),
  session: z.object({ signedInAt: z.iso.datetime(), expiresAt: z.iso.datetime() }),
});
/** GET /api/me for someone the provider knows but Trabeate has not invited (the "no access yet" page). */
export const meNoAccessSchema = z.object({
  access: z.literal('none'),
  identity: z.object({ email: z.string().nullable(), name: z.string().nullable() }),
  message: z.string(),
});
export const meSchema = z.discriminatedUnion('access', [meGrantedSchema, meNoAccessSchema]);
export type Me = z.infer<typeof meSchema>;

/** POST /api/auth/logout: the browser should go to endSessionUrl (the provider's sign-out) when present. */
export const logoutResponseSchema = z.object({ endSessionUrl: z.url().nullable() });
export type LogoutResponse = z.infer<typeof logoutResponseSchema>;

export const personStatusSchema = z.enum(['active', 'invited', 'removed']);
export const personSchema = z.object({
  id,
  email: z.string(),
  displayName: z.string(),
  role: roleSchema,
  clientOrganisation: orgRef.nullable(),
  status: personStatusSchema,
  projects: z.array(projectRef),
  lastSignedInAt: z.iso.datetime().nullable(),
  invitationExpiresAt: z.iso.datetime().nullable(),
});
export type Person = z.infer<typeof personSchema>;

export const invitationCreateSchema = z
  .object({
    email: z.email().max(254),
    displayName: z.string().trim().min(1).max(120),
    role: roleSchema,
    clientOrganisationId: id.optional(),
    projectIds: z.array(id).max(200).default([]),
  })
  .refine((v) => (v.role === 'client') === Boolean(v.clientOrganisationId), {
    message: 'a client contact needs a client organisation; firm staff must not have one',
    path: ['clientOrganisationId'],
  });
export type InvitationCreate = z.input<typeof invitationCreateSchema>;

/** The link is returned once, to the principal, until e-mail sends it. */
export const invitationCreatedSchema = z.object({
  person: personSchema,
  invitation: z.object({ url: z.url(), expiresAt: z.iso.datetime() }),
});
export type InvitationCreated = z.infer<typeof invitationCreatedSchema>;

/** GET /api/invitations/:token (public): what the invited person sees before signing in. */
export const invitationPreviewSchema = z.object({
  email: z.string(),
  displayName: z.string(),
  role: roleSchema,
  firmName: z.string(),
  status: z.enum(['pending', 'accepted', 'expired']),
  expiresAt: z.iso.datetime(),
  signInUrl: z.string(),
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;

export const personPatchSchema = z
  .object({
    displayName: z.string().trim().min(1).max(120).optional(),
    role: roleSchema.optional(),
    clientOrganisationId: id.nullable().optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'nothing to change' });
export type PersonPatch = z.infer<typeof personPatchSchema>;

export const clientOrganisationSchema = orgRef;

export const projectSummarySchema = z.object({
  id,
  reference: z.string(),
  name: z.string(),
  clientOrganisation: orgRef,
  siteAddress: z.string(),
  buildingUse: z.string(),
  storeys: z.number().int(),
});
export type ProjectSummary = z.infer<typeof projectSummarySchema>;

/** What the caller may do on this project; the client shows and hides controls from it. */
export const projectAbilitiesSchema = z.object({
  work: z.boolean(),
  manage: z.boolean(),
  seeFinance: z.boolean(),
  /** Review threads and working (deliverable) files: the firm's staff only. */
  seeInternal: z.boolean(),
  pay: z.boolean(),
  acknowledge: z.boolean(),
});
export type ProjectAbilities = z.infer<typeof projectAbilitiesSchema>;

export const projectDetailSchema = projectSummarySchema.extend({
  storeyHeightM: z.number(),
  floorAreaM2: z.number().nullable(),
  members: z.array(z.object({ id, displayName: z.string(), role: roleSchema })),
  /** Only for those who may see money (principal, the project's client contacts). */
  finance: z.object({ estimatedCost: z.number().nullable(), currency: z.string() }).nullable(),
  abilities: projectAbilitiesSchema,
});
export type ProjectDetail = z.infer<typeof projectDetailSchema>;
