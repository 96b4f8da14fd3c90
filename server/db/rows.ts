/** Row shapes of the tables, as SQLite returns them (snake_case, booleans as 0/1). */

export interface ClinicRow {
  id: number;
  name: string;
  currency: string;
  distance_unit: string;
  created_at: string;
}

export interface UserRow {
  id: number;
  clinic_id: number;
  email: string;
  name: string;
  role: 'owner' | 'coach' | 'athlete';
  password_hash: string | null;
  active: number | boolean;
  last_sign_in_at: string | null;
  created_at: string;
  updated_at: string;
  /** When the owner deactivated them (staff); null or absent while active. */
  deactivated_at?: string | null;
}

export interface AthleteRow {
  id: number;
  clinic_id: number;
  user_id: number | null;
  coach_id: number | null;
  first_name: string;
  last_name: string;
  email: string | null;
  date_of_birth: string | null;
  height_cm: number | null;
  distance_unit: 'km' | 'mi';
  weekly_km: number | null;
  longest_run_km: number | null;
  goal_event: string | null;
  goal_date: string | null;
  surfaces: string;
  notes: string | null;
  created_at: string;
  updated_at: string;
  /** Set once the athlete was erased (the row then holds only the reference); such a row is treated as absent. */
  erased_at?: string | null;
  erasure_ref?: string | null;
}

export interface InjuryRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  region: string;
  side: string;
  began: string;
  status: string;
  notes: string;
  position: number;
}

export interface PainRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  region: string;
  score: number;
  current: number | boolean;
  source: string;
  recorded_by: number | null;
  recorded_at: string;
}

export interface ConsentRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  kind: 'video_recording' | 'share_stills';
  granted: number | boolean;
  recorded_by: number | null;
  recorded_at: string;
}

export interface InvitationRow {
  id: number;
  clinic_id: number;
  email: string;
  name: string;
  role: 'owner' | 'coach' | 'athlete';
  athlete_id: number | null;
  token_hash: string;
  invited_by: number | null;
  expires_at: string;
  used_at: string | null;
  revoked_at: string | null;
  created_at: string;
}

export interface PasswordResetRow {
  id: number;
  user_id: number;
  token_hash: string;
  expires_at: string;
  used_at: string | null;
  created_at: string;
}

export interface MailboxRow {
  id: number;
  to_address: string;
  from_address: string;
  subject: string;
  text: string;
  html: string | null;
  received_at: string;
}
