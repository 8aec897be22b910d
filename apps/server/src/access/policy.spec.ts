import { canSeeProject, firmRefusal, projectRefusal, type Caller } from './policy';

const firm = 'f1';
const caller = (role: Caller['role'], org: string | null = null): Caller => ({
  userId: 'u',
  firmId: firm,
  email: 'e',
  displayName: 'n',
  role,
  clientOrganisationId: org,
});
const project = (callerIsMember: boolean, org = 'o1', firmId = firm) => ({
  firmId,
  clientOrganisationId: org,
  callerIsMember,
});

describe('access policy', () => {
  it('lets the principal see every project of the firm and none of another firm', () => {
    expect(canSeeProject(caller('principal'), project(false))).toBe(true);
    expect(canSeeProject(caller('principal'), project(true, 'o1', 'other-firm'))).toBe(false);
  });

  it('lets an engineer see only projects they are assigned to', () => {
    expect(canSeeProject(caller('engineer'), project(true))).toBe(true);
    expect(canSeeProject(caller('engineer'), project(false))).toBe(false);
  });

  it("lets a client contact see only their own organisation's projects they belong to", () => {
    expect(canSeeProject(caller('client', 'o1'), project(true, 'o1'))).toBe(true);
    expect(canSeeProject(caller('client', 'o1'), project(false, 'o1'))).toBe(false);
    // A stale membership after a move to another organisation must not show the old project.
    expect(canSeeProject(caller('client', 'o2'), project(true, 'o1'))).toBe(false);
  });

  it.each([
    [
      'principal',
      {
        read: true,
        work: true,
        manage: true,
        finance: true,
        pay: false,
        acknowledge: false,
        readSchemes: true,
        editSchemes: false,
      },
    ],
    [
      'engineer',
      {
        read: true,
        work: true,
        manage: false,
        finance: false,
        pay: false,
        acknowledge: false,
        readSchemes: true,
        editSchemes: true,
      },
    ],
    [
      'client',
      {
        read: true,
        work: false,
        manage: false,
        finance: true,
        pay: true,
        acknowledge: true,
        readSchemes: false,
        editSchemes: false,
      },
    ],
  ] as const)('allows a %s exactly these project actions', (role, allowed) => {
    for (const [action, ok] of Object.entries(allowed)) {
      const refusal = projectRefusal(role, action as keyof typeof allowed);
      expect({ action, allowed: refusal === null }).toEqual({ action, allowed: ok });
      if (!ok) expect(refusal).toMatch(/\w+/);
    }
  });

  it('keeps firm-level routes to staff, and principal routes to the principal', () => {
    expect(firmRefusal('engineer', 'firm')).toBeNull();
    expect(firmRefusal('client', 'firm')).toMatch(/firm's staff/);
    expect(firmRefusal('principal', 'principal')).toBeNull();
    expect(firmRefusal('engineer', 'principal')).toMatch(/principal/);
  });
});
