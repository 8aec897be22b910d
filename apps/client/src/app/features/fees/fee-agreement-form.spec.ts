import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { feeAgreementSchema, projectPageSchema, type FeeAgreement, type FeeAgreementWrite } from '@trabeate/contracts';
import { FeeAgreementForm } from './fee-agreement-form';
import { reply, replyError } from '../../../testing/api-replies';
import { PROJECT } from './fees-fixtures';
import { provideFirmDates } from '../../shared/dates/firm-date-adapter';

const CONTACT = { id: '00000000-0000-4000-8000-000000000211', displayName: 'Ines Marrow', role: 'client' as const };

// The first render in a file compiles the components; on a busy two-core machine that alone can pass 5 s.
jest.setTimeout(20_000);
describe('FeeAgreementForm', () => {
  let backend: HttpTestingController;

  async function mount(existing?: FeeAgreement) {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting(), provideFirmDates()],
    });
    backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(FeeAgreementForm);
    fixture.componentRef.setInput('projectId', PROJECT.id);
    fixture.detectChanges();
    await new Promise((r) => setTimeout(r));
    const agreementReq = backend.expectOne(`/api/projects/${PROJECT.id}/fee-agreement`);
    if (existing) reply(agreementReq, feeAgreementSchema, existing);
    else
      replyError(
        agreementReq,
        404,
        { code: 'not_found', message: 'This project has no fee agreement yet.' },
        'Not Found',
      );
    reply(backend.expectOne(`/api/projects/${PROJECT.id}/full`), projectPageSchema, {
      ...PROJECT,
      clientOrganisation: { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' },
      siteAddress: '9 Weir Street',
      buildingUse: 'Residential',
      storeys: 4,
      storeyHeightM: 3,
      floorAreaM2: null,
      designBasis: null,
      currency: 'EUR',
      archivedAt: null,
      finance: { estimatedCost: null, currency: 'EUR' },
      members: [CONTACT],
      stages: [],
      abilities: { work: true, manage: true, seeFinance: true, seeInternal: true, pay: false, acknowledge: false },
    });
    await new Promise((r) => setTimeout(r));
    fixture.detectChanges();
    return fixture;
  }
  const type = (root: HTMLElement, testid: string, value: string) => {
    const input = root.querySelector<HTMLInputElement>(`[data-testid="${testid}"]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  };

  afterEach(() => backend.verify());

  it('keeps a running total of the stage shares as you type and saves only at exactly 100 %', async () => {
    const fixture = await mount();
    const root = fixture.nativeElement as HTMLElement;
    const total = () => root.querySelector('[data-testid="share-total"]')!.textContent!.trim();
    expect(total()).toContain("Fill in every stage's share");
    const shares = ['10', '20', '25', '20', '5', '15'];
    ['design_basis', 'column_layout', 'beam_framing', 'slab_panels', 'stairs', 'foundations'].forEach((k, i) =>
      type(root, `share-${k}`, shares[i]),
    );
    fixture.detectChanges();
    expect(total()).toContain('add up to 95 %; they must add up to exactly 100 %');
    type(root, 'share-foundations', '20');
    fixture.detectChanges();
    expect(total()).toContain('✓ The shares add up to 100 %');
  });

  it('sends amounts in minor units and shares in basis points', async () => {
    const fixture = await mount();
    const root = fixture.nativeElement as HTMLElement;
    type(root, 'amount', '48000.50');
    ['design_basis', 'column_layout', 'beam_framing', 'slab_panels', 'stairs', 'foundations'].forEach((k, i) =>
      type(root, `share-${k}`, ['12.5', '20', '25', '20', '2.5', '20'][i]),
    );
    const component = fixture.componentInstance as unknown as { form: { patchValue(v: object): void } };
    component.form.patchValue({ billingContactId: CONTACT.id });
    fixture.detectChanges();
    root.querySelector<HTMLButtonElement>('[data-testid="save-agreement"]')!.click();
    const req = backend.expectOne(`/api/projects/${PROJECT.id}/fee-agreement`);
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toMatchObject({
      basis: 'lump_sum',
      lumpSumMinor: 4_800_050,
      currency: 'EUR',
      taxRateBp: 2000,
      billingContactId: CONTACT.id,
      stageShares: {
        design_basis: 1250,
        column_layout: 2000,
        beam_framing: 2500,
        slab_panels: 2000,
        stairs: 250,
        foundations: 2000,
      },
    });
    reply(req, feeAgreementSchema, {
      projectId: PROJECT.id,
      basis: 'lump_sum',
      lumpSumMinor: 4_800_050,
      percentageBp: null,
      constructionCostMinor: null,
      currency: 'EUR',
      taxRateBp: 2000,
      taxLabel: 'VAT',
      paymentTermsDays: 30,
      stageShares: (req.request.body as FeeAgreementWrite).stageShares,
      billingContact: { id: CONTACT.id, displayName: CONTACT.displayName, email: 'ines@quillon.example' },
      originalFeeMinor: 4_800_050,
      variations: [],
      currentFeeMinor: 4_800_050,
      stages: [],
      editable: true,
    });
    await new Promise((r) => setTimeout(r));
    fixture.detectChanges();
    expect(root.querySelector('[data-testid="agreement-saved"]')).not.toBeNull();
  });

  const SHARES = {
    design_basis: 1000,
    column_layout: 2000,
    beam_framing: 2500,
    slab_panels: 2000,
    stairs: 500,
    foundations: 2000,
  };
  const agreed = (over: Partial<FeeAgreement> = {}): FeeAgreement =>
    feeAgreementSchema.parse({
      projectId: PROJECT.id,
      basis: 'lump_sum',
      lumpSumMinor: 4_800_000,
      percentageBp: null,
      constructionCostMinor: null,
      currency: 'EUR',
      taxRateBp: 2000,
      taxLabel: 'VAT',
      paymentTermsDays: 30,
      billingContact: { id: CONTACT.id, displayName: CONTACT.displayName, email: 'ines@quillon.example' },
      stageShares: SHARES,
      originalFeeMinor: 4_800_000,
      variations: [
        {
          id: '00000000-0000-4000-8000-000000000701',
          amountMinor: 250_050,
          reason: 'Second stair core added',
          effectiveOn: '2026-10-14',
          recordedBy: 'Aster Pellow',
          recordedAt: '2026-10-14T09:30:00.000Z',
        },
      ],
      currentFeeMinor: 5_050_050,
      stages: [],
      editable: false,
      ...over,
    });

  it('lists each variation with its date, reason and signed amount', async () => {
    const fixture = await mount(agreed());
    const root = fixture.nativeElement as HTMLElement;
    const rows = root.querySelectorAll('[data-testid="variation-row"]');
    expect(rows.length).toBe(1);
    expect(rows[0].textContent).toContain('14 Oct 2026');
    expect(rows[0].textContent).toContain('Second stair core added');
    expect(rows[0].textContent).toContain('+ €2,500.50');
    expect(root.querySelector('[data-testid="variations"] caption')?.textContent).toContain('now €50,500.50');
  });

  it('says what a typed variation does to the fee as you type, and refuses one below zero', async () => {
    const fixture = await mount(agreed());
    const root = fixture.nativeElement as HTMLElement;
    const preview = () => root.querySelector('[data-testid="variation-preview"]')?.textContent?.trim();
    type(root, 'variation-amount', '-1500');
    fixture.detectChanges();
    expect(preview()).toBe('✓ Reduces the fee by €1,500.00; the fee becomes €49,000.50.');
    type(root, 'variation-amount', '12.345');
    fixture.detectChanges();
    expect(preview()).toContain('✗ Enter the change');
    type(root, 'variation-amount', '-60000');
    fixture.detectChanges();
    expect(preview()).toBe('✗ A variation cannot take the fee below zero.');
    // Nothing is sent while the form says no.
    root.querySelector<HTMLButtonElement>('[data-testid="add-variation"]')!.click();
    backend.expectNone(`/api/projects/${PROJECT.id}/fee-variations`);
  });

  it('records a variation in minor units and lists it from the answer', async () => {
    const fixture = await mount(agreed());
    const root = fixture.nativeElement as HTMLElement;
    type(root, 'variation-amount', '-1500');
    type(root, 'variation-reason', 'Basement omitted');
    type(root, 'variation-date', '20/11/2026');
    // the date field reads the firm's day-first order and writes the app's one format back
    root.querySelector<HTMLInputElement>('[data-testid="variation-date"]')!.dispatchEvent(new Event('blur'));
    fixture.detectChanges();
    expect(root.querySelector<HTMLInputElement>('[data-testid="variation-date"]')!.value).toBe('20 Nov 2026');
    root.querySelector<HTMLButtonElement>('[data-testid="add-variation"]')!.click();
    const req = backend.expectOne(`/api/projects/${PROJECT.id}/fee-variations`);
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ amountMinor: -150_000, reason: 'Basement omitted', effectiveOn: '2026-11-20' });
    const before = agreed();
    reply(req, feeAgreementSchema, {
      ...before,
      variations: [
        ...before.variations,
        {
          id: '00000000-0000-4000-8000-000000000702',
          amountMinor: -150_000,
          reason: 'Basement omitted',
          effectiveOn: '2026-11-20',
          recordedBy: 'Aster Pellow',
          recordedAt: '2026-11-20T10:00:00.000Z',
        },
      ],
      currentFeeMinor: 4_900_050,
    });
    await new Promise((r) => setTimeout(r));
    fixture.detectChanges();
    const rows = root.querySelectorAll('[data-testid="variation-row"]');
    expect(rows.length).toBe(2);
    expect(rows[1].textContent).toContain('− €1,500.00');
    expect(root.querySelector('[data-testid="variation-added"]')).not.toBeNull();
    expect(root.querySelector<HTMLInputElement>('[data-testid="variation-amount"]')!.value).toBe('');
  });
});
