import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import {
  checkoutOutcomeSchema,
  checkoutStartSchema,
  feeAgreementSchema,
  invoiceSchema,
  type CheckoutOutcome,
  type CheckoutStart,
  type CreditNoteCreate,
  type FeeAgreement,
  type FeeAgreementWrite,
  type FeeVariationCreate,
  type Invoice,
  type InvoiceDraftWrite,
  type PaymentCreate,
} from '@trabeate/contracts';
import { firstValueFrom, map } from 'rxjs';

const enc = encodeURIComponent;
export const invoiceUrl = (projectId: string, invoiceId: string) =>
  `/api/projects/${enc(projectId)}/invoices/${enc(invoiceId)}`;
export const agreementUrl = (projectId: string) => `/api/projects/${enc(projectId)}/fee-agreement`;

/** Where the payment page's way back is remembered (Stripe names the session on success only). */
export const CHECKOUT_KEY = (invoiceId: string) => `trabeate.checkout.${invoiceId}`;

/** Every write on fees and invoices; each answer is checked against its contract. */
@Injectable({ providedIn: 'root' })
export class FeesApi {
  private readonly http = inject(HttpClient);

  private call<T>(method: 'post' | 'put', url: string, body: unknown, parse: (v: unknown) => T): Promise<T> {
    return firstValueFrom(this.http.request(method, url, { body }).pipe(map(parse)));
  }

  saveAgreement(projectId: string, body: FeeAgreementWrite): Promise<FeeAgreement> {
    return this.call('put', agreementUrl(projectId), body, (v) => feeAgreementSchema.parse(v));
  }
  addVariation(projectId: string, body: FeeVariationCreate): Promise<FeeAgreement> {
    return this.call('post', `/api/projects/${enc(projectId)}/fee-variations`, body, (v) =>
      feeAgreementSchema.parse(v),
    );
  }
  createDraft(projectId: string, body: InvoiceDraftWrite): Promise<Invoice> {
    return this.call('post', `/api/projects/${enc(projectId)}/invoices`, body, (v) => invoiceSchema.parse(v));
  }
  updateDraft(projectId: string, invoiceId: string, body: InvoiceDraftWrite): Promise<Invoice> {
    return this.call('put', invoiceUrl(projectId, invoiceId), body, (v) => invoiceSchema.parse(v));
  }
  issue(projectId: string, invoiceId: string): Promise<Invoice> {
    return this.call('post', `${invoiceUrl(projectId, invoiceId)}/issue`, {}, (v) => invoiceSchema.parse(v));
  }
  void(projectId: string, invoiceId: string, reason: string): Promise<Invoice> {
    return this.call('post', `${invoiceUrl(projectId, invoiceId)}/void`, { reason }, (v) => invoiceSchema.parse(v));
  }
  creditNote(projectId: string, invoiceId: string, body: CreditNoteCreate): Promise<Invoice> {
    return this.call('post', `${invoiceUrl(projectId, invoiceId)}/credit-notes`, body, (v) => invoiceSchema.parse(v));
  }
  recordPayment(projectId: string, invoiceId: string, body: PaymentCreate): Promise<Invoice> {
    return this.call('post', `${invoiceUrl(projectId, invoiceId)}/payments`, body, (v) => invoiceSchema.parse(v));
  }
  checkout(projectId: string, invoiceId: string): Promise<CheckoutStart> {
    return this.call('post', `${invoiceUrl(projectId, invoiceId)}/checkout`, {}, (v) => checkoutStartSchema.parse(v));
  }
  reconcile(projectId: string, invoiceId: string, sessionId: string): Promise<CheckoutOutcome> {
    return this.call('post', `${invoiceUrl(projectId, invoiceId)}/checkout/${enc(sessionId)}/reconcile`, {}, (v) =>
      checkoutOutcomeSchema.parse(v),
    );
  }
}
