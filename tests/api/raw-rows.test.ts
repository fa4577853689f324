import { afterAll, describe, expect, it } from 'vitest';
import dayjs from 'dayjs';
import { setSequelize } from '../../server/db/current.js';
import { Facility, Organization, Sample, Standardization, Titrant, Titration, User, initModels } from '../../server/db/models/index.js';
import { insertBuilt } from '../../server/db/batchInsert.js';
import { fromRow, rawFind, selectList } from '../../server/db/rawRows.js';
import { as, demo } from '../fixtures/auth.js';
import { kestrelEffluent, makeAcidLot, makeResult } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';
import { QueryTypes, type Model, type ModelStatic } from 'sequelize';

const { app, sequelize } = apiTestApp();
initModels(sequelize);
setSequelize(sequelize);
afterAll(() => sequelize.close());

const plain = (m: Model) => m.get({ plain: true });

// The hot reads (session, sample, lot, standardisation, a new result's view) build instances
// from raw SELECTs; they must equal what Sequelize's own model queries give for the same rows.
describe('raw reads give the instances model queries give', () => {
  it.each([
    ['users', User],
    ['organizations', Organization],
    ['samples', Sample],
    ['titrants', Titrant],
    ['standardizations', Standardization],
    ['titrations', Titration],
  ] as Array<[string, ModelStatic<Model>]>)('every stored row of %s', async (_name, model) => {
    const byModel = await model.findAll({ order: [['id', 'ASC']] });
    const raw = await rawFind(model, '1 = 1 ORDER BY x.id', []);
    expect(byModel.length).toBeGreaterThan(0);
    expect(raw.map(plain)).toEqual(byModel.map(plain));
  });

  it('a joined row split by prefix (a sample and its facility)', async () => {
    const only = ['id', 'name', 'timezone', 'organizationId'] as const;
    const rows = await sequelize.query<Record<string, unknown>>(`SELECT ${selectList(Sample, 's')}, ${selectList(Facility, 'f', 'facility.', only)} FROM samples s JOIN facilities f ON f.id = s.facility_id ORDER BY s.id LIMIT 50`, { type: QueryTypes.SELECT });
    const byModel = await Sample.findAll({ include: [{ model: Facility, as: 'facility', attributes: [...only] }], order: [['id', 'ASC']], limit: 50 });
    expect(rows.map((r) => ({ ...plain(fromRow(Sample, r)), facility: plain(fromRow(Facility, r, 'facility.', only)) }))).toEqual(byModel.map(plain));
  });

  it('the entry route answers with the same view a later read gives', async () => {
    const acid = await makeAcidLot(app);
    const kf = await kestrelEffluent(app);
    const { titration } = await makeResult(app, demo.operator, { pointId: kf.point.id, titrantId: acid.id, analysedAt: dayjs().subtract(1, 'hour'), titreMl: 6.25 });
    const read = await (await as(app, demo.operator)).get(`/api/v1/titrations/${titration.id}`);
    expect(read.status).toBe(200);
    expect(read.body).toMatchObject(titration);
    expect(titration.analyst).toMatchObject({ name: expect.any(String) });
    expect(titration.titrant).toMatchObject({ id: acid.id });
  });
});

// The batch insert hands the connector UTC text, as Sequelize's own writes do: a Date given to
// the connector as it is goes in the process's local time, so a server not on UTC stored
// shifted times (the seed's results then came out analysed before their collection).
describe('the batch insert stores times in UTC whatever the process time zone', () => {
  it('a titration inserted under America/New_York reads back unshifted', async () => {
    const saved = process.env.TZ;
    const analysedAt = new Date('2026-03-08T06:30:15.123Z');
    process.env.TZ = 'America/New_York';
    let id: number;
    try {
      expect(new Date(2026, 2, 8, 6).getTimezoneOffset()).not.toBe(0); // the zone took effect
      const titration = (await Titration.findOne())!;
      const row = Titration.build({ ...titration.get({ plain: true }), id: undefined, analysedAt } as never);
      await sequelize.transaction(async (t) => {
        await insertBuilt(Titration, [row], t);
      });
      id = row.id;
    } finally {
      if (saved === undefined) delete process.env.TZ;
      else process.env.TZ = saved;
    }
    const back = await Titration.findByPk(id!);
    expect(back!.analysedAt.toISOString()).toBe('2026-03-08T06:30:15.123Z');
    const [text] = await sequelize.query<{ at: string }>('SELECT CAST(analysed_at AS CHAR) AS at FROM titrations WHERE id = ?', { replacements: [id!], type: QueryTypes.SELECT });
    expect(text.at).toBe('2026-03-08 06:30:15.123');
    await Titration.destroy({ where: { id: id! } });
  });
});
