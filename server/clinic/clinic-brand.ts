import type { Knex } from 'knex';
import type { ClinicLegalDetails } from '../../src/contracts/billing';
import type { ClinicBrand } from '../../src/contracts/demonstrations';
import { clinicLogoKey } from '../storage/media-keys';
import type { MediaStore } from '../storage/media-store';
import { readSmall } from '../storage/stored-objects';
import { clinicRepository } from './clinic-repository';

/** The clinic's logo as documents embed it. */
export interface LogoImage {
  png: Buffer;
  width: number;
  height: number;
}

/** What a document or e-mail of the clinic carries of it: name, legal details and logo. */
export interface BrandForDocuments {
  name: string;
  legal: ClinicLegalDetails;
  logo: LogoImage | null;
}

/** Reads a clinic's brand for documents and e-mails (no user check: callers have already checked theirs). */
export interface ClinicBrands {
  forDocuments(clinicId: number): Promise<BrandForDocuments>;
  /** The API view (`logoUrl` versioned, so a new logo is never served from a cache). */
  forApi(clinicId: number): Promise<ClinicBrand>;
}

/** The logo columns of a `clinics` row. */
export interface LogoRow {
  name: string;
  logo_version: number | null;
  logo_width: number | null;
  logo_height: number | null;
}

export function logoRow(db: Knex, clinicId: number): Promise<LogoRow | undefined> {
  return db('clinics').where({ id: clinicId }).first<LogoRow | undefined>('name', 'logo_version', 'logo_width', 'logo_height');
}

export function clinicBrands({ db, store }: { db: Knex; store: MediaStore }): ClinicBrands {
  return {
    async forDocuments(clinicId) {
      const row = await logoRow(db, clinicId);
      const legal = await clinicRepository.legalDetails(db, clinicId);
      let logo: LogoImage | null = null;
      if (row?.logo_version) {
        // A logo whose file went missing is left out rather than failing the document.
        const png = await readSmall(store, clinicLogoKey(clinicId, row.logo_version)).catch(() => null);
        if (png) logo = { png, width: row.logo_width ?? 0, height: row.logo_height ?? 0 };
      }
      return { name: row?.name ?? '', legal, logo };
    },
    async forApi(clinicId) {
      const row = await logoRow(db, clinicId);
      return {
        name: row?.name ?? '',
        legal: await clinicRepository.legalDetails(db, clinicId),
        logoUrl: row?.logo_version ? `/api/clinic/logo.png?v=${row.logo_version}` : null,
      };
    },
  };
}
