import { describe, expect, it } from 'vitest';
import { InputError } from '@shared/errors';
import {
  acidityRequestSchema,
  alkalinityRequestSchema,
  curveRequestSchema,
  lsiRequestSchema,
  speciationRequestSchema,
} from '@shared/schemas/calc';
import { parseOrThrow } from '@shared/schemas/parse';

function fieldsOf(schema: Parameters<typeof parseOrThrow>[0], body: unknown): Record<string, string> {
  try {
    parseOrThrow(schema, body);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).fields;
  }
  throw new Error('expected an InputError');
}

const volumes = { sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 2.1, volumeToTotalEndpointMl: 12.4 };
const readings = [
  { volumeMl: 0, pH: 9.2 },
  { volumeMl: 1, pH: 8.1 },
  { volumeMl: 12.5, pH: 4.52 },
  { volumeMl: 12.75, pH: 4.22 },
];

describe('alkalinity request (public calculation API)', () => {
  it('accepts each of the three input modes', () => {
    expect(parseOrThrow(alkalinityRequestSchema, volumes)).toEqual(volumes);
    expect(() => parseOrThrow(alkalinityRequestSchema, { sampleVolumeMl: 100, titrantNormality: 0.02, readings })).not.toThrow();
    expect(() =>
      parseOrThrow(alkalinityRequestSchema, {
        sampleVolumeMl: 200,
        titrantNormality: 0.02,
        lowAlkalinity: { firstEndpointPh: 4.5, volumeToFirstEndpointMl: 3.05, volumeToSecondEndpointMl: 3.5 },
      }),
    ).not.toThrow();
  });

  it.each([undefined, null, {}])('an empty body (%s) names every missing field', (body) => {
    expect(fieldsOf(alkalinityRequestSchema, body)).toEqual({
      sampleVolumeMl: 'required',
      titrantNormality: 'required',
      volumeToTotalEndpointMl: expect.stringMatching(/^required/),
      volumeToPh83Ml: 'required',
    });
  });

  it.each([
    { name: 'negative sample volume', body: { ...volumes, sampleVolumeMl: -5 }, field: 'sampleVolumeMl', reason: /greater than 0/ },
    { name: 'zero normality', body: { ...volumes, titrantNormality: 0 }, field: 'titrantNormality', reason: /greater than 0/ },
    { name: 'non-numeric normality', body: { ...volumes, titrantNormality: '0.02' }, field: 'titrantNormality', reason: /number/ },
    { name: 'NaN volume', body: { ...volumes, volumeToPh83Ml: Number.NaN }, field: 'volumeToPh83Ml', reason: /number/ },
    { name: 'infinite volume', body: { ...volumes, volumeToTotalEndpointMl: Number.POSITIVE_INFINITY }, field: 'volumeToTotalEndpointMl', reason: /./ },
    { name: 'negative volume', body: { ...volumes, volumeToPh83Ml: -0.1 }, field: 'volumeToPh83Ml', reason: /0 or more/ },
    { name: 'pH above 14', body: { ...volumes, totalEndpointPh: 14.2 }, field: 'totalEndpointPh', reason: /between 0 and 14/ },
    { name: 'pH below 0', body: { ...volumes, initialPh: -1 }, field: 'initialPh', reason: /between 0 and 14/ },
    { name: 'P volume above T volume', body: { ...volumes, volumeToPh83Ml: 13 }, field: 'volumeToPh83Ml', reason: /must not exceed volumeToTotalEndpointMl/ },
    { name: 'T without P', body: { sampleVolumeMl: 100, titrantNormality: 0.02, volumeToTotalEndpointMl: 5 }, field: 'volumeToPh83Ml', reason: /required/ },
    { name: 'readings with volumes going backwards', body: { sampleVolumeMl: 100, titrantNormality: 0.02, readings: [readings[0], readings[2], readings[1]] }, field: 'readings.2.volumeMl', reason: /cumulative/ },
    { name: 'reading pH out of range', body: { sampleVolumeMl: 100, titrantNormality: 0.02, readings: [readings[0], { volumeMl: 1, pH: 15 }] }, field: 'readings.1.pH', reason: /between 0 and 14/ },
    { name: 'reading volume missing', body: { sampleVolumeMl: 100, titrantNormality: 0.02, readings: [readings[0], { pH: 8 }] }, field: 'readings.1.volumeMl', reason: /required/ },
    { name: 'a single reading', body: { sampleVolumeMl: 100, titrantNormality: 0.02, readings: [readings[0]] }, field: 'readings', reason: /two readings/ },
    { name: 'readings and volumes together', body: { ...volumes, readings }, field: 'readings', reason: /only one of/ },
    { name: 'a misspelt field', body: { ...volumes, totalEndpointPH: 4.6 }, field: 'totalEndpointPH', reason: /unknown field/ },
    { name: 'an unsupported factor', body: { ...volumes, caco3Factor: 50040 }, field: 'caco3Factor', reason: /50000, 50044/ },
    { name: 'temperature outside the constants’ range', body: { ...volumes, temperatureC: 95 }, field: 'temperatureC', reason: /0 and 90/ },
    { name: 'TDS and conductance together', body: { ...volumes, tdsMgL: 300, specificConductanceUsCm: 500 }, field: 'specificConductanceUsCm', reason: /not both/ },
    { name: 'endpoint method without readings', body: { ...volumes, endpointMethod: 'gran' }, field: 'endpointMethod', reason: /readings/ },
    { name: 'unknown endpoint method', body: { sampleVolumeMl: 100, titrantNormality: 0.02, readings, endpointMethod: 'derivative' }, field: 'endpointMethod', reason: /fixed, inflection or gran/ },
    {
      name: 'two-point second volume not beyond the first',
      body: { sampleVolumeMl: 200, titrantNormality: 0.02, lowAlkalinity: { firstEndpointPh: 4.5, volumeToFirstEndpointMl: 3.05, volumeToSecondEndpointMl: 3.05 } },
      field: 'lowAlkalinity.volumeToSecondEndpointMl',
      reason: /greater than/,
    },
  ])('$name → 400 on $field', ({ body, field, reason }) => {
    const fields = fieldsOf(alkalinityRequestSchema, body);
    expect(fields[field]).toMatch(reason);
  });

  it('a body that is not an object is reported on "body"', () => {
    expect(Object.keys(fieldsOf(alkalinityRequestSchema, [1, 2]))).toContain('body');
    expect(Object.keys(fieldsOf(alkalinityRequestSchema, 'x'))).toContain('body');
  });

  it('the error message lists the fields and reasons', () => {
    expect(() => parseOrThrow(alkalinityRequestSchema, { ...volumes, sampleVolumeMl: -1 })).toThrow(/sampleVolumeMl: must be greater than 0/);
  });
});

describe('acidity request', () => {
  const body = { sampleVolumeMl: 50, titrantNormality: 0.02, volumeToPh37Ml: 1, volumeToPh83Ml: 9.2 };
  it.each([
    { name: 'empty body', body: {}, field: 'volumeToPh83Ml', reason: /required/ },
    { name: 'pH 3.7 volume beyond pH 8.3 volume', body: { ...body, volumeToPh37Ml: 10 }, field: 'volumeToPh37Ml', reason: /must not exceed volumeToPh83Ml/ },
    { name: 'negative peroxide acid volume', body: { ...body, peroxideTreatment: { acidVolumeMl: -5, acidNormality: 0.02 } }, field: 'peroxideTreatment.acidVolumeMl', reason: /greater than 0/ },
    { name: 'peroxide normality missing', body: { ...body, peroxideTreatment: { acidVolumeMl: 5 } }, field: 'peroxideTreatment.acidNormality', reason: /required/ },
  ])('$name → 400 on $field', ({ body: b, field, reason }) => {
    expect(fieldsOf(acidityRequestSchema, b)[field]).toMatch(reason);
  });
});

describe('speciation, curve and LSI requests', () => {
  it.each([
    { schema: speciationRequestSchema, body: {}, field: 'pH', reason: /required/ },
    { schema: speciationRequestSchema, body: { pH: 8, totalAlkalinity: 100, phenolphthaleinAlkalinity: 120 }, field: 'phenolphthaleinAlkalinity', reason: /must not exceed/ },
    { schema: speciationRequestSchema, body: { pH: 8, totalAlkalinity: 100, tdsMgL: 300, ionicStrength: 0.01 }, field: 'ionicStrength', reason: /only one of/ },
    { schema: curveRequestSchema, body: { sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: 100 }, field: 'initialPh', reason: /required/ },
    { schema: curveRequestSchema, body: { sampleVolumeMl: 100, titrantNormality: 0.02, initialPh: 8, totalAlkalinity: 100, totalCarbonateMmolL: 2 }, field: 'totalCarbonateMmolL', reason: /not both/ },
    { schema: curveRequestSchema, body: { sampleVolumeMl: 100, titrantNormality: 0.1, sampleType: 'strongAcid', concentrationM: 0.1, titrant: 'acid' }, field: 'titrant', reason: /titrated with base/ },
    { schema: curveRequestSchema, body: { sampleVolumeMl: 100, titrantNormality: 0.1, sampleType: 'strongBase' }, field: 'concentrationM', reason: /required/ },
    { schema: curveRequestSchema, body: { sampleVolumeMl: 100, titrantNormality: 0.02, initialPh: 8, totalAlkalinity: 100, volumesMl: [0, 2, 1] }, field: 'volumesMl.2', reason: /cumulative/ },
    { schema: curveRequestSchema, body: { sampleVolumeMl: 100, titrantNormality: 0.02, initialPh: 8, totalAlkalinity: 100, intervals: 2.5 }, field: 'intervals', reason: /whole number/ },
    { schema: lsiRequestSchema, body: { pH: 7.8, tdsMgL: 0, calciumHardness: 200, totalAlkalinity: 150 }, field: 'tdsMgL', reason: /greater than 0/ },
    { schema: lsiRequestSchema, body: { pH: 7.8, tdsMgL: 500, totalAlkalinity: 150 }, field: 'calciumHardness', reason: /required/ },
  ])('$field: $reason', ({ schema, body, field, reason }) => {
    expect(fieldsOf(schema, body)[field]).toMatch(reason);
  });
});
