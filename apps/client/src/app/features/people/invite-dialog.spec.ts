import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatSelectHarness } from '@angular/material/select/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { invitationCreatedSchema } from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { InviteDialog, type InviteDialogData, type InviteProjectChoice } from './invite-dialog';

const ORG_A = { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' };
const project: InviteProjectChoice = {
  id: '00000000-0000-4000-8000-000000000301',
  reference: 'LP-2026-003',
  name: 'Wickham Lane townhouses',
  clientOrganisation: ORG_A,
};

describe('InviteDialog', () => {
  let fixture: ComponentFixture<InviteDialog>;
  let backend: HttpTestingController;
  let closedWith: unknown[];
  const el = (): HTMLElement => fixture.nativeElement as HTMLElement;
  const q = <T extends Element>(sel: string) => el().querySelector<T>(sel);

  async function type(sel: string, value: string): Promise<void> {
    const input = q<HTMLInputElement>(sel)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    await fixture.whenStable();
  }

  beforeEach(async () => {
    closedWith = [];
    const data: InviteDialogData = { organisations: [ORG_A], projects: [project] };
    TestBed.configureTestingModule({
      imports: [InviteDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MatDialogRef, useValue: { close: (v: unknown) => closedWith.push(v) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(InviteDialog);
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  it('checks the e-mail as it is typed, before the field is left', async () => {
    expect(q('[data-testid="error-email"]')).toBeNull();
    await type('[data-testid="invite-email"]', 'marta@');
    expect(q('[data-testid="error-email"]')?.textContent?.trim()).toBe(
      'Enter an e-mail address like name@example.com.',
    );
    await type('[data-testid="invite-email"]', 'marta@example.test');
    expect(q('[data-testid="error-email"]')).toBeNull();
  });

  it('refuses to send with empty required fields and says which', async () => {
    q<HTMLButtonElement>('[data-testid="invite-send"]')!.click();
    await fixture.whenStable();
    backend.expectNone('/api/invitations');
    expect(q('[data-testid="error-email"]')?.textContent?.trim()).toBe('E-mail is required.');
    expect(q('[data-testid="error-displayName"]')?.textContent?.trim()).toBe('Name is required.');
  });

  it('asks for a client organisation only for a client contact, and requires it then', async () => {
    expect(q('[data-testid="invite-organisation"]')).toBeNull();
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const role = await loader.getHarness(MatSelectHarness.with({ selector: '[data-testid="invite-role"]' }));
    await role.open();
    await role.clickOptions({ text: 'Client contact' });
    await fixture.whenStable();
    expect(q('[data-testid="invite-organisation"]')).not.toBeNull();

    await type('[data-testid="invite-email"]', 'marta@example.test');
    await type('[data-testid="invite-name"]', 'Marta Quill');
    q<HTMLButtonElement>('[data-testid="invite-send"]')!.click();
    await fixture.whenStable();
    backend.expectNone('/api/invitations');
    expect(q('[data-testid="error-clientOrganisationId"]')?.textContent?.trim()).toBe(
      'Client organisation is required.',
    );
  });

  it('shows the server’s field errors beside the fields they belong to', async () => {
    await type('[data-testid="invite-email"]', 'ines@example.test');
    await type('[data-testid="invite-name"]', 'Ines Varrow');
    q<HTMLButtonElement>('[data-testid="invite-send"]')!.click();
    await fixture.whenStable();

    const req = backend.expectOne('/api/invitations');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({
      email: 'ines@example.test',
      displayName: 'Ines Varrow',
      role: 'engineer',
      projectIds: [],
    });
    replyError(req, 400, {
      code: 'validation_failed',
      message: 'Invalid body.email: already in use',
      fields: { 'body.email': ['Someone at the firm already uses this e-mail address.'] },
    });
    await fixture.whenStable();
    await new Promise((r) => setTimeout(r));
    await fixture.whenStable();
    expect(q('[data-testid="error-email"]')?.textContent?.trim()).toBe(
      'Someone at the firm already uses this e-mail address.',
    );
    expect(q('[data-testid="error-displayName"]')).toBeNull();

    // Changing the value clears the server's complaint; the local checks take over again.
    await type('[data-testid="invite-email"]', 'ines.v@example.test');
    expect(q('[data-testid="error-email"]')).toBeNull();
  });

  it('after inviting, shows the invitation link once, with a copy button', async () => {
    await type('[data-testid="invite-email"]', 'ines@example.test');
    await type('[data-testid="invite-name"]', 'Ines Varrow');
    q<HTMLButtonElement>('[data-testid="invite-send"]')!.click();
    const created = invitationCreatedSchema.parse({
      person: {
        id: '00000000-0000-4000-8000-000000000209',
        email: 'ines@example.test',
        displayName: 'Ines Varrow',
        role: 'engineer',
        clientOrganisation: null,
        status: 'invited',
        projects: [],
        lastSignedInAt: null,
        invitationExpiresAt: '2026-03-16T08:00:00.000Z',
      },
      invitation: {
        url: 'http://127.0.0.1:4310/invitations/tok_abcdefghijklmnopqrstuv',
        expiresAt: '2026-03-16T08:00:00.000Z',
      },
    });
    reply(backend.expectOne('/api/invitations'), invitationCreatedSchema, created, {
      status: 201,
      statusText: 'Created',
    });
    await new Promise((r) => setTimeout(r));
    await fixture.whenStable();
    expect(q('[data-testid="invitation-url"]')?.textContent).toBe(
      'http://127.0.0.1:4310/invitations/tok_abcdefghijklmnopqrstuv',
    );
    expect(el().textContent).toContain('Copy link');
    Array.from(el().querySelectorAll('button'))
      .find((b) => b.textContent?.includes('Done'))!
      .click();
    expect(closedWith).toEqual([created]);
  });
});
