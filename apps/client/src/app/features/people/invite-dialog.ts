import { CdkCopyToClipboard } from '@angular/cdk/clipboard';
import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { ErrorStateMatcher, MatOption } from '@angular/material/core';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import type { InvitationCreate, InvitationCreated, ProjectListItem, Role } from '@trabeate/contracts';
import { firstValueFrom } from 'rxjs';
import { errorMessage, fieldErrors } from '../../core/auth/api-error';
import { ROLE_LABELS } from '../../core/auth/session';
import { applyServerErrors, asYouType, fieldErrorText } from '../../shared/forms/field-errors';

/** What the dialog needs of a project: the people page passes items of the paged project list. */
export type InviteProjectChoice = Pick<ProjectListItem, 'id' | 'reference' | 'name' | 'clientOrganisation'>;

export interface InviteDialogData {
  readonly organisations: readonly { id: string; name: string }[];
  readonly projects: readonly InviteProjectChoice[];
  /** Projects beyond the page the people page loaded; they can be joined later from the project. */
  readonly projectsLeftOut?: number;
}

const notBlank = (c: { value: string }) => (c.value && !c.value.trim() ? { whitespace: true } : null);

/** Invites a person: staff or a client contact, optionally straight onto projects. */
@Component({
  selector: 'tb-invite-dialog',
  imports: [
    CdkCopyToClipboard,
    ReactiveFormsModule,
    MatButton,
    MatDialogActions,
    MatDialogClose,
    MatDialogContent,
    MatDialogTitle,
    MatError,
    MatFormField,
    MatHint,
    MatLabel,
    MatIcon,
    MatInput,
    MatSelect,
    MatOption,
  ],
  providers: [{ provide: ErrorStateMatcher, useValue: asYouType }],
  templateUrl: './invite-dialog.html',
  styleUrl: './invite-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InviteDialog {
  private readonly http = inject(HttpClient);
  private readonly ref = inject<MatDialogRef<InviteDialog, InvitationCreated | null>>(MatDialogRef);
  protected readonly data = inject<InviteDialogData>(MAT_DIALOG_DATA);
  protected readonly roles = Object.entries(ROLE_LABELS) as [Role, string][];

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email, Validators.maxLength(254)]],
    displayName: ['', [Validators.required, Validators.maxLength(120), notBlank]],
    role: ['engineer' as Role, Validators.required],
    clientOrganisationId: [{ value: '', disabled: true }, Validators.required],
    projectIds: [[] as string[]],
  });

  protected readonly sending = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly created = signal<InvitationCreated | null>(null);
  protected readonly copied = signal(false);
  protected readonly errorText = fieldErrorText;

  constructor() {
    // Only a client contact belongs to a client organisation; staff must not have one.
    this.form.controls.role.valueChanges.pipe(takeUntilDestroyed(inject(DestroyRef))).subscribe((role) => {
      const org = this.form.controls.clientOrganisationId;
      if (role === 'client') org.enable();
      else {
        org.reset('');
        org.disable();
      }
    });
  }

  /** Projects a client contact may join are their own organisation's. */
  protected projectChoices(): readonly InviteProjectChoice[] {
    const { role, clientOrganisationId } = this.form.getRawValue();
    if (role !== 'client') return this.data.projects;
    return this.data.projects.filter((p) => p.clientOrganisation.id === clientOrganisationId);
  }

  protected async send(): Promise<void> {
    if (this.sending()) return;
    this.form.markAllAsTouched();
    if (this.form.invalid) return;
    this.sending.set(true);
    this.formError.set(null);
    const v = this.form.getRawValue();
    const body: InvitationCreate = {
      email: v.email.trim(),
      displayName: v.displayName.trim(),
      role: v.role,
      projectIds: v.projectIds,
      ...(v.role === 'client' ? { clientOrganisationId: v.clientOrganisationId } : {}),
    };
    try {
      this.created.set(await firstValueFrom(this.http.post<InvitationCreated>('/api/invitations', body)));
    } catch (err) {
      const unmatched = applyServerErrors(this.form.controls, fieldErrors(err));
      const fields = Object.keys(fieldErrors(err)).length;
      this.formError.set(unmatched.length ? unmatched.join(' ') : fields ? null : errorMessage(err));
    } finally {
      this.sending.set(false);
    }
  }

  protected done(): void {
    this.ref.close(this.created());
  }
}
