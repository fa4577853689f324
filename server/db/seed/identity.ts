import bcrypt from 'bcryptjs';
import type { Role } from '../../../shared/roles.js';
import { Facility, MonitoringPoint, Organization, User } from '../models/index.js';
import type { SeedStep } from './index.js';

/** The invented demo scenario of product.md: one contract lab and three client utilities. */
export const DEMO = {
  lab: { name: 'Marrowfield Analytical', contactEmail: 'lab@marrowfield.example', address: '14 Tannery Row, Marrowfield' },
  utilities: [
    {
      name: 'Brindlemoor Water Authority',
      contactEmail: 'office@brindlemoor.example',
      billingEmail: 'accounts@brindlemoor.example',
      facility: { name: 'Brindlemoor Surface Water Plant', kind: 'drinking_water' as const, timezone: 'America/Chicago', address: '2 Reservoir Lane, Brindlemoor' },
      points: [
        { code: 'RAW-1', name: 'Raw water intake', matrix: 'raw' as const },
        { code: 'FIN-1', name: 'Finished water clearwell', matrix: 'finished' as const },
      ],
    },
    {
      name: 'Kestrel Ford Sanitary District',
      contactEmail: 'office@kestrelford.example',
      billingEmail: 'billing@kestrelford.example',
      facility: { name: 'Kestrel Ford Water Reclamation Plant', kind: 'wastewater' as const, timezone: 'America/Denver', address: '900 Ford Road, Kestrel Ford' },
      points: [
        { code: 'INF-1', name: 'Plant influent', matrix: 'influent' as const },
        { code: 'AB-1', name: 'Aeration basin 1', matrix: 'process' as const },
        { code: 'DIG-1', name: 'Primary anaerobic digester', matrix: 'digester' as const },
        { code: 'EFF-001', name: 'Final effluent, outfall 001', matrix: 'effluent' as const },
      ],
    },
    {
      name: 'Quillon Bay Utilities',
      contactEmail: 'office@quillonbay.example',
      billingEmail: 'accounts@quillonbay.example',
      facility: { name: 'Quillon Bay Wellfield', kind: 'drinking_water' as const, timezone: 'America/New_York', address: '31 Dune Street, Quillon Bay' },
      points: [
        { code: 'WELL-3', name: 'Well 3 raw water', matrix: 'raw' as const },
        { code: 'EP-1', name: 'Entry point 1', matrix: 'finished' as const },
      ],
    },
  ],
  users: [
    { email: 'admin@marrowfield.example', name: 'Odile Fenwick', role: 'lab_admin', org: 'Marrowfield Analytical' },
    { email: 'analyst@marrowfield.example', name: 'Tobiah Lark', role: 'analyst', org: 'Marrowfield Analytical' },
    { email: 'operator@kestrelford.example', name: 'Renata Quade', role: 'operator', org: 'Kestrel Ford Sanitary District' },
    { email: 'compliance@kestrelford.example', name: 'Hollis Varga', role: 'compliance_officer', org: 'Kestrel Ford Sanitary District' },
    { email: 'billing@kestrelford.example', name: 'Mina Osgood', role: 'billing', org: 'Kestrel Ford Sanitary District' },
    { email: 'operator@brindlemoor.example', name: 'Caspar Wynn', role: 'operator', org: 'Brindlemoor Water Authority' },
    { email: 'operator@quillonbay.example', name: 'Delphine Marsh', role: 'operator', org: 'Quillon Bay Utilities' },
  ] satisfies { email: string; name: string; role: Role; org: string }[],
};

export const seedIdentity: SeedStep['run'] = async ({ config, transaction }) => {
  const lab = await Organization.create({ ...DEMO.lab, kind: 'laboratory', labId: null }, { transaction });
  const orgs = new Map<string, number>([[lab.name, lab.id]]);
  for (const u of DEMO.utilities) {
    const org = await Organization.create({ name: u.name, kind: 'utility', labId: lab.id, contactEmail: u.contactEmail, billingEmail: u.billingEmail }, { transaction });
    orgs.set(org.name, org.id);
    const f = await Facility.create({ ...u.facility, organizationId: org.id }, { transaction });
    await MonitoringPoint.bulkCreate(u.points.map((p) => ({ ...p, facilityId: f.id })), { transaction });
  }
  const passwordHash = await bcrypt.hash(config.DEMO_PASSWORD, 10);
  await User.bulkCreate(
    DEMO.users.map((u) => ({ email: u.email, name: u.name, role: u.role, organizationId: orgs.get(u.org)!, passwordHash })),
    { transaction },
  );
};
