import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import {
  schemeDetailSchema,
  schemeVersionSchema,
  type SchemeCreate,
  type SchemeDetail,
  type SchemeDocument,
  type SchemeVersion,
} from '@trabeate/contracts';
import { firstValueFrom, map } from 'rxjs';

const enc = encodeURIComponent;
export const schemesUrl = (projectId: string) => `/api/projects/${enc(projectId)}/schemes`;
export const schemeUrl = (projectId: string, schemeId: string) => `${schemesUrl(projectId)}/${enc(schemeId)}`;

/** Every write on schemes; each answer is checked against the contract before the page uses it. */
@Injectable({ providedIn: 'root' })
export class SchemesApi {
  private readonly http = inject(HttpClient);

  private detail(request: ReturnType<HttpClient['post']>): Promise<SchemeDetail> {
    return firstValueFrom(request.pipe(map((body) => schemeDetailSchema.parse(body))));
  }

  create(projectId: string, body: SchemeCreate): Promise<SchemeDetail> {
    return this.detail(this.http.post(schemesUrl(projectId), body));
  }

  duplicate(projectId: string, schemeId: string): Promise<SchemeDetail> {
    return this.detail(this.http.post(`${schemeUrl(projectId, schemeId)}/duplicate`, {}));
  }

  rename(projectId: string, schemeId: string, name: string): Promise<SchemeDetail> {
    return this.detail(this.http.patch(schemeUrl(projectId, schemeId), { name }));
  }

  setArchived(projectId: string, schemeId: string, archived: boolean): Promise<SchemeDetail> {
    return this.detail(this.http.post(`${schemeUrl(projectId, schemeId)}/${archived ? 'archive' : 'restore'}`, {}));
  }

  save(projectId: string, schemeId: string, baseVersion: number, document: SchemeDocument): Promise<SchemeDetail> {
    return this.detail(this.http.put(`${schemeUrl(projectId, schemeId)}/document`, { baseVersion, document }));
  }

  /** One earlier save in full, to open in the editor. */
  version(projectId: string, schemeId: string, version: number): Promise<SchemeVersion> {
    return firstValueFrom(
      this.http
        .get(`${schemeUrl(projectId, schemeId)}/versions/${version}`)
        .pipe(map((body) => schemeVersionSchema.parse(body))),
    );
  }

  /** Makes an earlier save the newest one again (a new save that says where it came from). */
  restoreVersion(projectId: string, schemeId: string, version: number): Promise<SchemeDetail> {
    return this.detail(this.http.post(`${schemeUrl(projectId, schemeId)}/versions/${version}/restore`, {}));
  }
}
