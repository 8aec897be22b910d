import { z } from 'zod';

/**
 * Every notice Trabeate sends: its data (checked before anything is queued), its subject, and
 * the body as HTML and as plain text. Bodies go inside the shared layout (layout.ts). Templates
 * live in code rather than .hbs files so the bundled server carries them.
 */
const link = z.url();
const name = z.string().min(1).max(200);

export const mailTemplates = {
  'stage-submitted': {
    data: z.object({
      recipientName: name,
      firmName: name,
      projectName: name,
      stageName: name,
      submittedBy: name,
      note: z.string().max(4000).optional(),
      link,
    }),
    subject: '{{projectName}}: {{stageName}} is ready for your review',
    html: `<p>Hello {{recipientName}},</p>
<p>{{submittedBy}} has submitted <strong>{{stageName}}</strong> of <strong>{{projectName}}</strong> for your review.</p>
{{#if note}}<p style="margin:16px 0;padding:12px 16px;background:#f3f5f5;border-left:3px solid #016973;white-space:pre-line;">{{note}}</p>{{/if}}
<p>Please look through the deliverables and either approve the stage or return it with your comments.</p>
{{> button label="Review the stage"}}`,
    text: `Hello {{recipientName}},

{{submittedBy}} has submitted {{stageName}} of {{projectName}} for your review.
{{#if note}}

Note from {{submittedBy}}:
{{note}}
{{/if}}

Please look through the deliverables and either approve the stage or return it with your comments.

Review the stage: {{link}}`,
  },

  'stage-returned': {
    data: z.object({
      recipientName: name,
      firmName: name,
      projectName: name,
      stageName: name,
      returnedBy: name,
      comment: z.string().min(1).max(8000),
      link,
    }),
    subject: '{{projectName}}: {{stageName}} was returned with comments',
    html: `<p>Hello {{recipientName}},</p>
<p>{{returnedBy}} has returned <strong>{{stageName}}</strong> of <strong>{{projectName}}</strong> with these comments:</p>
<p style="margin:16px 0;padding:12px 16px;background:#f3f5f5;border-left:3px solid #016973;white-space:pre-line;">{{comment}}</p>
<p>Once the points are addressed, submit the stage again from the project page.</p>
{{> button label="Open the stage"}}`,
    text: `Hello {{recipientName}},

{{returnedBy}} has returned {{stageName}} of {{projectName}} with these comments:

{{comment}}

Once the points are addressed, submit the stage again from the project page.

Open the stage: {{link}}`,
  },

  'stage-approved': {
    data: z.object({ recipientName: name, firmName: name, projectName: name, stageName: name, approvedBy: name, link }),
    subject: '{{projectName}}: {{stageName}} is approved',
    html: `<p>Hello {{recipientName}},</p>
<p>{{approvedBy}} has approved <strong>{{stageName}}</strong> of <strong>{{projectName}}</strong>. The approved deliverables are kept with the stage.</p>
{{> button label="See the stage"}}`,
    text: `Hello {{recipientName}},

{{approvedBy}} has approved {{stageName}} of {{projectName}}. The approved deliverables are kept with the stage.

See the stage: {{link}}`,
  },

  invitation: {
    data: z.object({
      recipientName: name.optional(),
      firmName: name,
      invitedBy: name,
      role: name,
      link,
      expiresOn: z.string().min(1).max(60),
    }),
    subject: '{{invitedBy}} invites you to {{firmName}} on Trabeate',
    html: `<p>Hello{{#if recipientName}} {{recipientName}}{{/if}},</p>
<p>{{invitedBy}} has invited you to join <strong>{{firmName}}</strong> on Trabeate as <strong>{{role}}</strong>.</p>
<p>The link below is personal and works until {{expiresOn}}. If you did not expect this invitation, you can ignore this message.</p>
{{> button label="Accept the invitation"}}`,
    text: `Hello{{#if recipientName}} {{recipientName}}{{/if}},

{{invitedBy}} has invited you to join {{firmName}} on Trabeate as {{role}}.

The link below is personal and works until {{expiresOn}}. If you did not expect this invitation, you can ignore this message.

Accept the invitation: {{link}}`,
  },
  'drawings-issued': {
    data: z.object({
      recipientName: z.string().max(200),
      firmName: name,
      projectName: name,
      reference: name,
      purpose: name,
      note: z.string().max(4000).optional(),
      items: z
        .array(
          z.object({
            number: name,
            title: name,
            code: name,
            suitability: name,
            fileLink: link,
          }),
        )
        .min(1),
      sheetLink: link,
      zipLink: link,
      /** For outside recipients: when their signed links stop working. */
      expiresOn: z.string().max(60).optional(),
      /** The page to open and acknowledge receipt (client contacts); absent for outside recipients. */
      link: link.optional(),
    }),
    subject: '{{projectName}}: drawings issued under {{reference}}',
    html: `<p>Hello{{#if recipientName}} {{recipientName}}{{/if}},</p>
<p>{{firmName}} has issued drawings of <strong>{{projectName}}</strong> under transmittal <strong>{{reference}}</strong> ({{purpose}}).</p>
{{#if note}}<p style="margin:16px 0;padding:12px 16px;background:#f3f5f5;border-left:3px solid #016973;white-space:pre-line;">{{note}}</p>{{/if}}
<ul>{{#each items}}<li><a href="{{fileLink}}">{{number}} revision {{code}}</a> ({{suitability}}): {{title}}</li>{{/each}}</ul>
<p><a href="{{sheetLink}}">Transmittal sheet (PDF)</a> · <a href="{{zipLink}}">All files as one ZIP</a></p>
{{#if expiresOn}}<p>These links are for you alone and work until {{expiresOn}}.</p>{{/if}}
{{#if link}}<p>Please confirm that you have received them.</p>
{{> button label="Open and acknowledge"}}{{/if}}`,
    text: `Hello{{#if recipientName}} {{recipientName}}{{/if}},

{{firmName}} has issued drawings of {{projectName}} under transmittal {{reference}} ({{purpose}}).
{{#if note}}

{{note}}
{{/if}}

{{#each items}}
- {{number}} revision {{code}} ({{suitability}}): {{title}}
  {{fileLink}}
{{/each}}

Transmittal sheet (PDF): {{sheetLink}}
All files as one ZIP: {{zipLink}}
{{#if expiresOn}}

These links are for you alone and work until {{expiresOn}}.
{{/if}}
{{#if link}}

Please confirm that you have received them: {{link}}
{{/if}}`,
  },
} as const;

export type MailTemplateName = keyof typeof mailTemplates;
export type MailData<N extends MailTemplateName> = z.input<(typeof mailTemplates)[N]['data']>;
