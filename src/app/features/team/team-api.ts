import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { PendingInvitation, StaffDeactivate, StaffList, StaffMember } from '../../../contracts/api';
import { skipErrorSnackbar } from '../../core/http-context';

/** HTTP for the clinic's staff and coach invitations (owner only). */
@Injectable({ providedIn: 'root' })
export class TeamApi {
  private readonly http = inject(HttpClient);

  /** Staff members and pending invitations. */
  list(): Observable<StaffList> {
    return this.http.get<StaffList>('/api/staff', { context: skipErrorSnackbar() });
  }

  /** Invites a coach by e-mail; 409 when the address is already in use (shown inline). */
  inviteCoach(body: { name: string; email: string }): Observable<PendingInvitation> {
    return this.http.post<PendingInvitation>('/api/staff/invitations', body, {
      context: skipErrorSnackbar(409, 422),
    });
  }

  /** Deactivates a coach (signed out at once); their athletes go to `reassignTo`. */
  deactivate(id: number, body: StaffDeactivate): Observable<StaffMember> {
    return this.http.post<StaffMember>(`/api/staff/${id}/deactivate`, body);
  }

  /** Lets a deactivated coach sign in again. */
  reactivate(id: number): Observable<StaffMember> {
    return this.http.post<StaffMember>(`/api/staff/${id}/reactivate`, {});
  }

  /** Revokes a pending invitation so its link stops working. */
  revoke(id: number): Observable<void> {
    return this.http.delete<void>(`/api/staff/invitations/${id}`).pipe(map(() => undefined));
  }
}
