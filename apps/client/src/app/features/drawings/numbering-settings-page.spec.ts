import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { drawingSettingsSchema } from '@trabeate/contracts';
import { NumberingSettingsPage, patternExample } from './numbering-settings-page';

// Fixtures go through the contracts' schema: a shape the API would never send fails here first.
const stored = drawingSettingsSchema.parse({ revisionScheme: 'iso19650', numberPattern: '{project}-S-{seq:3}' });

describe('NumberingSettingsPage', () => {
  let backend: HttpTestingController;
  let harness: RouterTestingHarness;
  const el = () => harness.routeNativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    harness.detectChanges();
  };
  const patternInput = () => el().querySelector('input[formcontrolname="numberPattern"]') as HTMLInputElement;
  const type = async (value: string) => {
    patternInput().value = value;
    patternInput().dispatchEvent(new Event('input'));
    await settle();
  };
  const text = (testid: string) => el().querySelector(`[data-testid="${testid}"]`)?.textContent?.trim() ?? '';

  async function open(): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'drawings/numbering', component: NumberingSettingsPage }]),
        provideHttpClient(),
        provideHttpClientTesting(),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl('/drawings/numbering');
    await settle();
  }

  afterEach(() => backend.verify());

  it('fills the form from the stored settings and previews the first number', async () => {
    await open();
    expect(el().textContent).toContain('Loading the firm');
    backend.expectOne('/api/drawing-settings').flush(stored);
    await settle();
    expect(patternInput().value).toBe('{project}-S-{seq:3}');
    expect(text('pattern-example')).toBe('REF-S-001');
    const iso = el().querySelector('[data-testid="scheme-iso19650"] input') as HTMLInputElement;
    expect(iso.checked).toBe(true);
  });

  it('says what is wrong with a pattern as it is typed, and sends nothing until it is right', async () => {
    await open();
    backend.expectOne('/api/drawing-settings').flush(stored);
    await settle();
    await type('S-{seq:3}-{seq:2}');
    expect(text('pattern-error')).toBe('Exactly one {seq:N} with N from 1 to 6.');
    await type('S/{seq:3}');
    expect(text('pattern-error')).toBe('Besides {project} and {seq:N}, only letters, digits and . _ -.');
    (el().querySelector('[data-testid="save-numbering"]') as HTMLButtonElement).click();
    await settle();
    expect(text('form-error')).toContain('needs attention');
    backend.expectNone('/api/drawing-settings');
  });

  it('saves the pattern and the letters-then-numbers scheme once, even when clicked twice', async () => {
    await open();
    backend.expectOne('/api/drawing-settings').flush(stored);
    await settle();
    await type('  ST-{seq:4}  ');
    expect(text('pattern-example')).toBe('ST-0001');
    (el().querySelector('[data-testid="scheme-letters_numbers"] input') as HTMLInputElement).click();
    await settle();
    const save = el().querySelector('[data-testid="save-numbering"]') as HTMLButtonElement;
    save.click();
    save.click();
    await settle();
    const put = backend.expectOne({ method: 'PUT', url: '/api/drawing-settings' });
    expect(put.request.body).toEqual({ revisionScheme: 'letters_numbers', numberPattern: 'ST-{seq:4}' });
    put.flush(drawingSettingsSchema.parse(put.request.body));
    await settle();
    expect(patternInput().value).toBe('ST-{seq:4}');
    expect(save.disabled).toBe(false);
  });

  it('puts the server’s refusal beside the field it names', async () => {
    await open();
    backend.expectOne('/api/drawing-settings').flush(stored);
    await settle();
    await type('D-{seq:2}');
    (el().querySelector('[data-testid="save-numbering"]') as HTMLButtonElement).click();
    await settle();
    backend.expectOne({ method: 'PUT', url: '/api/drawing-settings' }).flush(
      {
        error: {
          code: 'validation_failed',
          message: 'Some fields are not valid.',
          fields: { 'body.numberPattern': ['this pattern would renumber nothing; pick another'] },
        },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await settle();
    expect(text('pattern-error')).toBe('this pattern would renumber nothing; pick another');
  });

  it('shows why the settings could not be loaded and tries again', async () => {
    await open();
    backend.expectOne('/api/drawing-settings').flush(
      { error: { code: 'service_unavailable', message: 'The database is not answering.' } },
      {
        status: 503,
        statusText: 'Service Unavailable',
      },
    );
    await settle();
    expect(el().querySelector('[role="alert"]')?.textContent).toContain('The database is not answering.');
    (el().querySelector('[role="alert"] button') as HTMLButtonElement).click();
    await settle();
    backend.expectOne('/api/drawing-settings').flush(stored);
    await settle();
    expect(patternInput().value).toBe('{project}-S-{seq:3}');
  });

  it('gives the first number of a pattern for a project reference', () => {
    expect(patternExample('{project}-{seq:2}', 'QT-07')).toBe('QT-07-01');
    expect(patternExample('S-{seq:3}', 'QT-07')).toBe('S-001');
  });
});
