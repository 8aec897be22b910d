import { HttpClient, HttpEvent } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import {
  drawingSchema,
  nextNumberSchema,
  revisionSchema,
  transmittalSchema,
  type Drawing,
  type DrawingCreate,
  type Revision,
  type RevisionAction,
  type RevisionCreate,
  type RevisionFile,
  type Transmittal,
  type TransmittalCreate,
} from '@trabeate/contracts';
import { Observable, firstValueFrom, map } from 'rxjs';
import { UPLOAD_HTTP, projectUrl } from '../projects/projects-api';

/** Every write on the register. Reads go through httpResource (with the contracts' parse) in the components. */
@Injectable({ providedIn: 'root' })
export class DrawingsApi {
  private readonly http = inject(HttpClient);
  private readonly uploadHttp = inject(UPLOAD_HTTP);

  nextNumber(projectId: string): Promise<{ number: string; pattern: string }> {
    return firstValueFrom(
      this.http.get(`${projectUrl(projectId)}/drawings/next-number`).pipe(map((x) => nextNumberSchema.parse(x))),
    );
  }

  createDrawing(projectId: string, body: DrawingCreate): Promise<Drawing> {
    return firstValueFrom(
      this.http.post(`${projectUrl(projectId)}/drawings`, body).pipe(map((x) => drawingSchema.parse(x))),
    );
  }

  registerRevision(projectId: string, drawingId: string, body: RevisionCreate): Promise<Revision> {
    return firstValueFrom(
      this.http
        .post(`${projectUrl(projectId)}/drawings/${encodeURIComponent(drawingId)}/revisions`, body)
        .pipe(map((x) => revisionSchema.parse(x))),
    );
  }

  transition(projectId: string, revisionId: string, action: RevisionAction): Promise<Revision> {
    return firstValueFrom(
      this.http
        .post(`${projectUrl(projectId)}/revisions/${encodeURIComponent(revisionId)}/transitions`, { action })
        .pipe(map((x) => revisionSchema.parse(x))),
    );
  }

  /** Streams progress events, then the stored file. */
  upload(
    projectId: string,
    revisionId: string,
    role: 'pdf' | 'source',
    file: File,
  ): Observable<HttpEvent<RevisionFile>> {
    const form = new FormData();
    form.append('file', file, file.name);
    return this.uploadHttp.post<RevisionFile>(
      `${projectUrl(projectId)}/revisions/${encodeURIComponent(revisionId)}/files?role=${role}`,
      form,
      { reportProgress: true, observe: 'events' },
    );
  }

  issue(projectId: string, body: TransmittalCreate): Promise<Transmittal> {
    return firstValueFrom(
      this.http.post(`${projectUrl(projectId)}/transmittals`, body).pipe(map((x) => transmittalSchema.parse(x))),
    );
  }

  acknowledge(projectId: string, transmittalId: string): Promise<Transmittal> {
    return firstValueFrom(
      this.http
        .post(`${projectUrl(projectId)}/transmittals/${encodeURIComponent(transmittalId)}/acknowledge`, {})
        .pipe(map((x) => transmittalSchema.parse(x))),
    );
  }
}
