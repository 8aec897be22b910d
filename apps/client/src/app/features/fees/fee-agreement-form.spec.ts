import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { feeAgreementSchema, projectPageSchema } from '@trabeate/contracts';
import { FeeAgreementForm } from './fee-agreement-form';
import { PROJECT } from './fees-fixtures';

const CONTACT = { id: '00000000-0000-4000-8000-000000000211', displayName: 'Ines Marrow', role: 'client' as const };

// The first render in a file compiles the components; on a busy two-core machine that alone can pass 5 s.
jest.setTimeout(20_000);
describe('FeeAgreementForm', () => {
  let backend: HttpTestingController;

  async function mount() {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(FeeAgreementForm);
    fixture.componentRef.setInput('projectId', PROJECT.id);
    fixture.detectChanges();
    await new Promise((r) => setTimeout(r));
    backend
      .expectOne(`/api/projects/${PROJECT.id}/fee-agreement`)
      .flush(
        { error: { code: 'not_found', message: 'This project has no fee agreement yet.' } },
        { status: 404, statusText: 'Not Found' },
      );
    backend.expectOne(`/api/projects/${PROJECT.id}/full`).flush(
      projectPageSchema.parse({
        ...PROJECT,
        clientOrganisation: { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' },
        siteAddress: '9 Weir Street',
        buildingUse: 'Residential',
        storeys: 4,
        storeyHeightM: 3,
        floorAreaM2: null,
        designBasis: null,
        archivedAt: null,
        finance: { estimatedCost: null, currency: 'EUR' },
        members: [CONTACT],
        stages: [],
        abilities: { work: true, manage: true, seeFinance: true, pay: false, acknowledge: false },
      }),
    );
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
    req.flush(
      feeAgreementSchema.parse({
        projectId: PROJECT.id,
        ...req.request.body,
        billingContact: { id: CONTACT.id, displayName: CONTACT.displayName, email: 'ines@quillon.example' },
        originalFeeMinor: 4_800_050,
        variations: [],
        currentFeeMinor: 4_800_050,
        stages: [],
        editable: true,
      }),
    );
    await new Promise((r) => setTimeout(r));
    fixture.detectChanges();
    expect(root.querySelector('[data-testid="agreement-saved"]')).not.toBeNull();
  });
});
