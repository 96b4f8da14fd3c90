import type { Readable } from 'node:stream';
import type { Knex } from 'knex';
import type { SessionUser } from '../../src/contracts/api';
import type { ClinicLegalDetails } from '../../src/contracts/billing';
import type { ClinicBrand } from '../../src/contracts/demonstrations';
import { audit } from '../audit/audit-log';
import { clinicLogoKey } from '../storage/media-keys';
import { NotFoundError } from '../errors';
import type { PictureProcessor } from '../pictures/picture-pool';
import { assertRole } from '../policy/enforce';
import type { MediaStore } from '../storage/media-store';
import { clinicBrands, logoRow } from './clinic-brand';
import { clinicRepository } from './clinic-repository';

/** The clinic's own settings an owner keeps: the legal details invoices and receipts carry, and the logo. */
export interface ClinicService {
  legalDetails(user: SessionUser): Promise<ClinicLegalDetails>;
  putLegalDetails(user: SessionUser, details: ClinicLegalDetails): Promise<ClinicLegalDetails>;
  /** Name, legal details and logo URL, for every page of the clinic (the portal's header too). */
  brand(user: SessionUser): Promise<ClinicBrand>;
  /** The logo PNG. 404 when there is none. */
  logo(user: SessionUser): Promise<Readable>;
  /** Processes (upright, ≤ 600 px, metadata-free PNG with its transparency) and stores a new logo. */
  putLogo(user: SessionUser, bytes: Buffer): Promise<ClinicBrand>;
  removeLogo(user: SessionUser): Promise<void>;
}

export interface ClinicServiceDeps {
  db: Knex;
  clock: () => Date;
  store: MediaStore;
  pictures: PictureProcessor;
}

export function clinicService({ db, clock, store, pictures }: ClinicServiceDeps): ClinicService {
  const brands = clinicBrands({ db, store });
  return {
    async legalDetails(user) {
      assertRole(user, 'clinic-legal:read');
      return clinicRepository.legalDetails(db, user.clinicId);
    },
    async putLegalDetails(user, details) {
      assertRole(user, 'clinic-legal:update');
      await db.transaction(async (trx) => {
        await clinicRepository.putLegalDetails(trx, user.clinicId, details);
        await audit(trx, { clinicId: user.clinicId, actorId: user.id, action: 'clinic.legal_details_updated' }, clock().toISOString());
      });
      return clinicRepository.legalDetails(db, user.clinicId);
    },
    async brand(user) {
      assertRole(user, 'clinic-brand:read');
      return brands.forApi(user.clinicId);
    },
    async logo(user) {
      assertRole(user, 'clinic-brand:read');
      const row = await logoRow(db, user.clinicId);
      if (!row?.logo_version) throw new NotFoundError('Logo');
      return store.get(clinicLogoKey(user.clinicId, row.logo_version));
    },
    async putLogo(user, bytes) {
      assertRole(user, 'clinic-logo:update');
      const logo = await pictures.logo(bytes);
      const before = await logoRow(db, user.clinicId);
      const version = (before?.logo_version ?? 0) + 1;
      const key = clinicLogoKey(user.clinicId, version);
      await store.put(key, logo.bytes);
      try {
        await db.transaction(async (trx) => {
          await trx('clinics')
            .where({ id: user.clinicId })
            .update({ logo_version: version, logo_width: logo.width, logo_height: logo.height });
          await audit(trx, { clinicId: user.clinicId, actorId: user.id, action: 'clinic.logo_updated' }, clock().toISOString());
        });
      } catch (err) {
        await store.remove(key);
        throw err;
      }
      if (before?.logo_version) await store.remove(clinicLogoKey(user.clinicId, before.logo_version));
      return brands.forApi(user.clinicId);
    },
    async removeLogo(user) {
      assertRole(user, 'clinic-logo:update');
      const before = await logoRow(db, user.clinicId);
      await db.transaction(async (trx) => {
        await trx('clinics').where({ id: user.clinicId }).update({ logo_version: null, logo_width: null, logo_height: null });
        await audit(trx, { clinicId: user.clinicId, actorId: user.id, action: 'clinic.logo_removed' }, clock().toISOString());
      });
      if (before?.logo_version) await store.remove(clinicLogoKey(user.clinicId, before.logo_version));
    },
  };
}
