import { EnvironmentInjector, Injectable, InjectionToken, createEnvironmentInjector, inject } from '@angular/core';
import {
  HttpBackend,
  HttpClient,
  HttpEvent,
  HttpXhrBackend,
  provideHttpClient,
  withInterceptors,
  withXsrfConfiguration,
} from '@angular/common/http';
import type {
  Comment,
  Deliverable,
  ProjectCreate,
  ProjectPage,
  ProjectUpdate,
  Stage,
  StageKey,
  StagePatch,
  StageTransition,
} from '@trabeate/contracts';
import { Observable, firstValueFrom } from 'rxjs';
import { authInterceptor } from '../../core/auth/auth.interceptor';

/**
 * An HttpClient over XMLHttpRequest for uploads. The app's client uses fetch, which cannot report
 * upload progress; this one keeps the same interceptors and CSRF header. Tests swap in the app's
 * client so HttpTestingController sees the upload.
 */
export const UPLOAD_HTTP = new InjectionToken<HttpClient>('UPLOAD_HTTP', {
  providedIn: 'root',
  factory: () =>
    createEnvironmentInjector(
      [
        provideHttpClient(
          withInterceptors([authInterceptor]),
          withXsrfConfiguration({ cookieName: 'XSRF-TOKEN', headerName: 'X-XSRF-TOKEN' }),
        ),
        { provide: HttpBackend, useExisting: HttpXhrBackend },
      ],
      inject(EnvironmentInjector),
    ).get(HttpClient),
});

const enc = encodeURIComponent;
export const projectUrl = (projectId: string) => `/api/projects/${enc(projectId)}`;
export const stageUrl = (projectId: string, stage: StageKey) => `${projectUrl(projectId)}/stages/${enc(stage)}`;

/** Every write on projects and stages. Reads go through httpResource in the pages. */
@Injectable({ providedIn: 'root' })
export class ProjectsApi {
  private readonly http = inject(HttpClient);
  private readonly uploadHttp = inject(UPLOAD_HTTP);

  create(body: ProjectCreate): Promise<ProjectPage> {
    return firstValueFrom(this.http.post<ProjectPage>('/api/projects', body));
  }

  update(projectId: string, body: ProjectUpdate): Promise<unknown> {
    return firstValueFrom(this.http.patch(projectUrl(projectId), body));
  }

  /** Archive, or bring back (`restore`) an archived project. */
  setArchived(projectId: string, archived: boolean): Promise<unknown> {
    return firstValueFrom(this.http.post(`${projectUrl(projectId)}/${archived ? 'archive' : 'restore'}`, {}));
  }

  patchStage(projectId: string, stage: StageKey, body: StagePatch): Promise<Stage> {
    return firstValueFrom(this.http.patch<Stage>(stageUrl(projectId, stage), body));
  }

  transition(projectId: string, stage: StageKey, body: StageTransition): Promise<Stage> {
    return firstValueFrom(this.http.post<Stage>(`${stageUrl(projectId, stage)}/transitions`, body));
  }

  addComment(projectId: string, stage: StageKey, body: string): Promise<Comment> {
    return firstValueFrom(this.http.post<Comment>(`${stageUrl(projectId, stage)}/comments`, { body }));
  }

  /** Streams progress events, then the stored version. */
  upload(projectId: string, stage: StageKey, file: File): Observable<HttpEvent<Deliverable>> {
    const form = new FormData();
    form.append('file', file, file.name);
    return this.uploadHttp.post<Deliverable>(`${stageUrl(projectId, stage)}/deliverables`, form, {
      reportProgress: true,
      observe: 'events',
    });
  }
}
