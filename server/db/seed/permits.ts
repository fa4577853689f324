import dayjs from 'dayjs';
import { DEFAULT_CERTIFICATION_WORDING } from '../../../shared/schemas/permits.js';
import { reevaluate, setComplianceConfig } from '../../services/compliance.js';
import { setSequelize } from '../current.js';
import { Facility, MonitoringPoint, Permit, PermitLimit } from '../models/index.js';
import type { SeedStep } from './index.js';

const REGULATOR = { name: 'Water Quality Permits Desk', email: 'permits@statewater.example' };

interface DemoLimit {
  point: string;
  parameter: PermitLimit['parameter'];
  statistic: PermitLimit['statistic'];
  bound: PermitLimit['bound'];
  value: string;
  units: PermitLimit['units'];
  significantFigures?: number;
  decimals?: number;
}

/** Invented demo permits whose limits the demo results break a few times (product.md scenario). */
const DEMO_PERMITS: { facility: string; number: string; authority: string; followUp: string; deadline: [number, 'hours' | 'days']; limits: DemoLimit[] }[] = [
  {
    facility: 'Kestrel Ford Water Reclamation Plant',
    number: 'KF-0042-WW',
    authority: 'State Department of Water Quality (invented)',
    followUp: 'Resample the effluent within 24 hours, identify the cause, and send a written explanation to the permits desk.',
    deadline: [5, 'days'],
    limits: [
      { point: 'EFF-001', parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', value: '50', units: 'mg/L as CaCO3', significantFigures: 2 },
      { point: 'EFF-001', parameter: 'total_alkalinity', statistic: 'monthly_average', bound: 'minimum', value: '60', units: 'mg/L as CaCO3', significantFigures: 2 },
      { point: 'EFF-001', parameter: 'ph', statistic: 'instantaneous', bound: 'minimum', value: '6.0', units: 'S.U.', decimals: 1 },
      { point: 'EFF-001', parameter: 'ph', statistic: 'instantaneous', bound: 'maximum', value: '9.0', units: 'S.U.', decimals: 1 },
    ],
  },
  {
    facility: 'Brindlemoor Surface Water Plant',
    number: 'BM-PWS-118',
    authority: 'State Drinking Water Program (invented)',
    followUp: 'Report the excursion and the corrective action in the next monthly operating report.',
    deadline: [48, 'hours'],
    limits: [{ point: 'FIN-1', parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', value: '20', units: 'mg/L as CaCO3', significantFigures: 2 }],
  },
  {
    facility: 'Quillon Bay Wellfield',
    number: 'QB-PWS-077',
    authority: 'State Drinking Water Program (invented)',
    followUp: 'Report the excursion in the next monthly operating report.',
    deadline: [7, 'days'],
    limits: [{ point: 'EP-1', parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', value: '100', units: 'mg/L as CaCO3', significantFigures: 3 }],
  },
];

export const seedPermits: SeedStep['run'] = async ({ transaction }) => {
  const effectiveFrom = dayjs().subtract(1, 'year').startOf('year').format('YYYY-MM-DD');
  for (const d of DEMO_PERMITS) {
    const facility = await Facility.findOne({ where: { name: d.facility }, transaction });
    if (!facility) continue;
    const permit = await Permit.create(
      {
        organizationId: facility.organizationId,
        facilityId: facility.id,
        number: d.number,
        issuingAuthority: d.authority,
        effectiveFrom,
        expiresOn: dayjs(effectiveFrom).add(5, 'year').subtract(1, 'day').format('YYYY-MM-DD'),
        regulatorContacts: [REGULATOR],
        followUpText: d.followUp,
        followUpDeadlineValue: d.deadline[0],
        followUpDeadlineUnit: d.deadline[1],
        certificationWording: DEFAULT_CERTIFICATION_WORDING,
      },
      { transaction },
    );
    for (const l of d.limits) {
      const point = await MonitoringPoint.findOne({ where: { facilityId: facility.id, code: l.point }, transaction });
      if (!point) continue;
      await PermitLimit.create(
        { permitId: permit.id, pointId: point.id, parameter: l.parameter, statistic: l.statistic, bound: l.bound, value: l.value, units: l.units, significantFigures: l.significantFigures ?? null, decimals: l.decimals ?? null, reportingLimit: null, effectiveFrom, effectiveTo: null },
        { transaction },
      );
    }
  }
};

/** Judges the demo months against the demo permits, through the same path an approval takes. */
export const seedCompliance: SeedStep['run'] = async ({ sequelize, config }) => {
  setSequelize(sequelize);
  setComplianceConfig(config);
  const months = Array.from({ length: 4 }, (_, i) => dayjs().subtract(3 - i, 'month').format('YYYY-MM'));
  for (const permit of await Permit.findAll()) await reevaluate(permit.facilityId, months, null);
};
