import dayjs from 'dayjs';
import { Facility, Organization, User } from '../models/index.js';
import { actorFor } from '../../services/actor.js';
import { certifyReport, createReport } from '../../services/reports.js';
import { setSequelize } from '../current.js';
import type { SeedStep } from './index.js';

/**
 * Kestrel Ford's report two months back, certified by its compliance officer through the
 * same service as the app (so its PDF, hash and e-mail are real), and last month's draft.
 */
export const seedReports: SeedStep['run'] = async ({ sequelize, config }) => {
  setSequelize(sequelize);
  const user = await User.findOne({ where: { email: 'compliance@kestrelford.example' }, include: [{ model: Organization, as: 'organization' }] });
  const facility = user ? await Facility.findOne({ where: { organizationId: user.organizationId }, order: [['id', 'ASC']] }) : null;
  if (!user || !facility) return;
  const actor = await actorFor(user);
  const certified = await createReport(actor, { facilityId: facility.id, month: dayjs().subtract(2, 'month').format('YYYY-MM') });
  await certifyReport(actor, certified.id, { password: config.DEMO_PASSWORD, statement: 'Reviewed with the plant superintendent before signing.' });
  await createReport(actor, { facilityId: facility.id, month: dayjs().subtract(1, 'month').format('YYYY-MM') });
};
