import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { routes } from './app.routes';

describe('app routes', () => {
  let harness: RouterTestingHarness;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [provideRouter(routes), provideHttpClient(), provideHttpClientTesting()],
    });
    harness = await RouterTestingHarness.create();
  });

  const shownText = () => (harness.routeNativeElement?.textContent ?? '').replace(/\s+/g, ' ');

  it('opens Projects for the bare address', async () => {
    await harness.navigateByUrl('/');
    expect(TestBed.inject(Router).url).toBe('/projects');
    expect(shownText()).toContain('Projects are being built next');
  });

  it.each([
    ['/projects', 'Projects are being built next', 'Design basis, Column layout, Beam framing'],
    ['/drawings', 'The drawing register is on its way', 'purpose of issue'],
    ['/fees', 'Fees and invoices are coming soon', 'adding up to 100 %'],
  ])('%s shows a designed placeholder that says what is coming', async (url, heading, detail) => {
    await harness.navigateByUrl(url);
    expect(shownText()).toContain(heading);
    expect(shownText()).toContain('What is coming');
    expect(shownText()).toContain(detail);
  });

  it('/status loads the status page, which asks the server for its health', async () => {
    await harness.navigateByUrl('/status');
    harness.detectChanges();
    TestBed.inject(HttpTestingController).expectOne('/api/health');
    expect(shownText()).toContain('System status');
  });

  it('an unknown address says there is no page there', async () => {
    await harness.navigateByUrl('/no/such/page');
    expect(shownText()).toContain('There is no page at this address');
  });
});
