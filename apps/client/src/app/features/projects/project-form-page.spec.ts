import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { clientOrganisationSchema, projectPageSchema, type ProjectPage } from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { aProjectPage } from '../../../testing/fixtures';
import { ProjectFormPage } from './project-form-page';

const ORG = { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' };
const PROJECT_ID = '00000000-0000-4000-8000-000000000301';

describe('ProjectFormPage', () => {
  let fixture: ComponentFixture<ProjectFormPage>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const input = (name: string) => el().querySelector(`[data-testid="field-${name}"]`) as HTMLInputElement;
  const type = async (name: string, value: string) => {
    const i = input(name);
    i.value = value;
    i.dispatchEvent(new Event('input'));
    await fixture.whenStable();
  };
  const errorBeside = (name: string) =>
    input(name).closest('mat-form-field')?.querySelector('mat-error')?.textContent?.trim();
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    await fixture.whenStable();
  };

  async function open(projectId?: string, project?: Partial<ProjectPage>): Promise<void> {
    TestBed.configureTestingModule({
      imports: [ProjectFormPage],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ProjectFormPage);
    if (projectId) fixture.componentRef.setInput('projectId', projectId);
    fixture.detectChanges();
    TestBed.tick();
    reply(backend.expectOne('/api/client-organisations'), clientOrganisationSchema.array(), [ORG]);
    if (projectId)
      reply(
        backend.expectOne(`/api/projects/${projectId}/full`),
        projectPageSchema,
        aProjectPage({ ...project, id: projectId }),
      );
    await settle();
  }

  /** Fills what a new project needs beyond the starting values. */
  async function fillValid(): Promise<void> {
    await type('reference', 'QTH-2026/04');
    await type('name', 'Ferrow Lane apartments');
    fixture.componentInstance['form'].controls.clientOrganisationId.setValue(ORG.id);
    await type('concretePerM3', '140');
    await type('steelPerKg', '1.3');
    await type('formworkPerM2', '30');
    await fixture.whenStable();
  }

  afterEach(() => backend.verify());

  it('checks the reference as it is typed, with the rule the server applies', async () => {
    await open();
    await type('reference', '-bad ref');
    expect(errorBeside('reference')).toBe('Use letters, digits and . _ / - only, starting with a letter or digit.');
    await type('reference', 'Q');
    expect(errorBeside('reference')).toBe('Reference needs at least 2 characters.');
    await type('reference', 'QTH-7');
    expect(errorBeside('reference')).toBeUndefined();
  });

  it('holds design basis values to the contract’s limits, in their units', async () => {
    await open();
    await type('concreteMPa', '8');
    expect(errorBeside('concreteMPa')).toBe('Concrete strength must be at least 10 MPa.');
    await type('steelMPa', '900');
    expect(errorBeside('steelMPa')).toBe('Reinforcement yield strength can be at most 700 MPa.');
    await type('bearingPressureKPa', '0');
    expect(errorBeside('bearingPressureKPa')).toBe('Allowable bearing pressure must be more than 0 kPa.');
    await type('storeys', '2.5');
    expect(errorBeside('storeys')).toBe('Storeys must be a whole number.');
    await type('currency', 'eur');
    expect(errorBeside('currency')).toBe('A three-letter currency code such as EUR.');
  });

  it('asks for unit rates in the project’s currency, none below zero, and none made up', async () => {
    await open();
    expect(input('concretePerM3').value).toBe('');
    await type('steelPerKg', '-1');
    expect(errorBeside('steelPerKg')).toBe('Reinforcement rate must be at least 0 EUR/kg.');
    await type('currency', 'GBP');
    await type('formworkPerM2', '');
    expect(errorBeside('formworkPerM2')).toBe('Formwork rate is required.');
    await type('steelPerKg', '1.1');
    expect(errorBeside('steelPerKg')).toBeUndefined();
    expect(input('steelPerKg').closest('mat-form-field')?.textContent).toContain('GBP/kg');
  });

  it('sends nothing while the form is invalid, and says what needs attention', async () => {
    await open();
    (el().querySelector('[data-testid="save-project"]') as HTMLButtonElement).click();
    await fixture.whenStable();
    backend.expectNone('/api/projects');
    const invalid = Array.from(el().querySelectorAll<HTMLElement>('input.ng-invalid, mat-select.ng-invalid'));
    const summary = `${invalid.length} fields need attention.`;
    expect(invalid.length).toBeGreaterThan(1);
    expect(el().querySelector('[data-testid="form-error"]')?.textContent).toContain(summary);
    expect(errorBeside('name')).toBe('Name is required.');
    // Focus leaves the button for the first field in error, and the count is announced.
    expect(document.activeElement).toBe(invalid[0]);
    await new Promise((r) => setTimeout(r, 150));
    expect(document.querySelector('.cdk-live-announcer-element')?.textContent).toBe(summary);
  });

  it('creates once however often Create is pressed, then opens the new project', async () => {
    await open();
    await fillValid();
    const navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    const button = el().querySelector('[data-testid="save-project"]') as HTMLButtonElement;
    button.click();
    button.click();
    await fixture.whenStable();
    expect(button.disabled).toBe(true);
    const req = backend.expectOne('/api/projects');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toMatchObject({
      reference: 'QTH-2026/04',
      name: 'Ferrow Lane apartments',
      clientOrganisationId: ORG.id,
      storeys: 4,
      floorAreaM2: null,
      currency: 'EUR',
      designBasis: {
        codeFamily: 'EN1992',
        concreteMPa: 30,
        steelMPa: 500,
        bearingPressureKPa: 150,
        rates: { concretePerM3: 140, steelPerKg: 1.3, formworkPerM2: 30 },
      },
    });
    reply(req, projectPageSchema, aProjectPage({ id: PROJECT_ID, reference: 'QTH-2026/04' }), {
      status: 201,
      statusText: 'Created',
    });
    await settle();
    expect(navigate).toHaveBeenCalledWith(['/projects', PROJECT_ID]);
  });

  it('puts the server’s field messages beside the fields they concern, nested ones included', async () => {
    await open();
    await fillValid();
    (el().querySelector('[data-testid="save-project"]') as HTMLButtonElement).click();
    replyError(backend.expectOne('/api/projects'), 400, {
      code: 'validation_failed',
      message: 'Invalid body.reference: already used',
      fields: {
        'body.reference': ['Reference QTH-2026/04 is already used by another project.'],
        'body.designBasis.concreteMPa': ['Too high for this code family.'],
      },
    });
    await settle();
    expect(errorBeside('reference')).toBe('Reference QTH-2026/04 is already used by another project.');
    expect(errorBeside('concreteMPa')).toBe('Too high for this code family.');
    // Changing the value clears the server's complaint; the local rules take over again.
    await type('reference', 'QTH-2026/05');
    expect(errorBeside('reference')).toBeUndefined();
  });

  it('when editing, fills the form from the project and saves with PATCH', async () => {
    const project: Partial<ProjectPage> = {
      id: PROJECT_ID,
      reference: 'QTH-1',
      name: 'Block one',
      clientOrganisation: ORG,
      siteAddress: '4 Ferrow Lane',
      buildingUse: 'Apartments',
      storeys: 6,
      storeyHeightM: 3.1,
      floorAreaM2: 1800,
      finance: { estimatedCost: 2_400_000, currency: 'GBP' },
      designBasis: {
        codeFamily: 'IS456',
        concreteMPa: 25,
        steelMPa: 415,
        imposedKPa: 2,
        superimposedDeadKPa: 1,
        bearingPressureKPa: 200,
        foundingDepthM: 2,
        rates: { concretePerM3: 120, steelPerKg: 0.95, formworkPerM2: 18 },
      },
    };
    await open(PROJECT_ID, project);
    expect(input('reference').value).toBe('QTH-1');
    expect(input('concreteMPa').value).toBe('25');
    await type('name', 'Block one, revised');
    jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    (el().querySelector('[data-testid="save-project"]') as HTMLButtonElement).click();
    const req = backend.expectOne(`/api/projects/${PROJECT_ID}`);
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toMatchObject({
      name: 'Block one, revised',
      currency: 'GBP',
      designBasis: { codeFamily: 'IS456', steelMPa: 415, rates: { steelPerKg: 0.95 } },
    });
    reply(req, projectPageSchema, aProjectPage({ ...project, id: PROJECT_ID, name: 'Block one, revised' }));
    await settle();
  });
});
