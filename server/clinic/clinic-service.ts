import type { Knex } from 'knex';
import type { SessionUser } from '../../src/contracts/api';
import type { ClinicLegalDetails } from '../../src/contracts/billing';
import { audit } from '../audit/audit-log';
import { assertRole } from '../policy/enforce';
import { clinicRepository } from './clinic-repository';

/** The clinic's own settings an owner keeps: the legal details invoices and receipts carry. */
export interface ClinicService {
  legalDetails(user: SessionUser): Promise<ClinicLegalDetails>;
  putLegalDetails(user: SessionUser, details: ClinicLegalDetails): Promise<ClinicLegalDetails>;
}

export function clinicService({ db, clock }: { db: Knex; clock: () => Date }): ClinicService {
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
  };
}
