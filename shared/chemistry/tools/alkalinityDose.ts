import { EQUIVALENT_WEIGHT } from '../constants';
import { feedRate, type FeedRate, type Flow } from './units';

/** Chemicals that raise alkalinity, by their trade names. */
export type AlkalinityChemical = 'lime' | 'quicklime' | 'caustic_soda' | 'soda_ash' | 'sodium_bicarbonate' | 'magnesium_hydroxide';

export interface ChemicalInfo {
  name: string;
  formula: string;
  /** g/eq (= mg/meq) as base [domain.md 8.5, computed from molar masses]. */
  equivalentWeight: number;
  /** Handling cautions for the people who feed it [domain.md 10; common practice; the SDS governs]. */
  cautions: string[];
}

/** Equivalent weights and handling cautions [domain.md 8.5 table; domain.md 10; common practice]. */
export const ALKALINITY_CHEMICALS: Readonly<Record<AlkalinityChemical, ChemicalInfo>> = {
  lime: {
    name: 'Hydrated lime',
    formula: 'Ca(OH)2',
    equivalentWeight: 37.05,
    cautions: ['Hydrated lime is a caustic dust: it burns eyes and skin and irritates the lungs. Wear splash goggles, gloves and a dust mask when handling it.'],
  },
  quicklime: {
    name: 'Quicklime',
    formula: 'CaO',
    equivalentWeight: 28.04,
    cautions: [
      'Quicklime is caustic and reacts with water, releasing heat (slaking): keep it dry and slake it only in equipment made for it.',
      'Wear splash goggles, a face shield, gloves and a dust mask.',
    ],
  },
  caustic_soda: {
    name: 'Caustic soda',
    formula: 'NaOH',
    equivalentWeight: 40.0,
    cautions: [
      'Caustic soda is corrosive: it causes severe skin burns and serious eye damage, and releases heat when diluted. Add caustic to water slowly, never water to caustic.',
      'Wear splash goggles and a face shield, chemical-resistant gloves and an apron; an eyewash and safety shower must be reachable.',
    ],
  },
  soda_ash: {
    name: 'Soda ash',
    formula: 'Na2CO3',
    equivalentWeight: 52.99,
    cautions: ['Soda ash dust irritates eyes and airways. Wear goggles and a dust mask when handling it.'],
  },
  sodium_bicarbonate: {
    name: 'Sodium bicarbonate',
    formula: 'NaHCO3',
    equivalentWeight: 84.01,
    cautions: ['Sodium bicarbonate is of low hazard; avoid breathing the dust and keep it dry.'],
  },
  magnesium_hydroxide: {
    name: 'Magnesium hydroxide',
    formula: 'Mg(OH)2',
    equivalentWeight: 29.16,
    cautions: ['Magnesium hydroxide slurry is alkaline and irritates the eyes. Wear goggles; keep the slurry agitated so it does not settle in lines.'],
  },
};

export const ALKALINITY_CHEMICAL_KEYS = Object.keys(ALKALINITY_CHEMICALS) as AlkalinityChemical[];

/** Cautions for every chemical dose [product.md, cautions; domain.md 10]. */
export const DOSING_CAUTIONS: readonly string[] = [
  'Read the chemical’s SDS before handling it.',
  'A dose raises pH as well as alkalinity (lime and caustic most sharply): confirm by jar test and watch the pH after any change.',
  'The permit, local codes and licensed practice govern chemical feed; this is a calculation aid, not an operating instruction.',
];

/** mg of chemical per mg/L of alkalinity as CaCO3 = equivalent weight ÷ 50.04 [domain.md 8.5, computed from equivalent weights]. */
export function chemicalPerAlkalinity(chemical: AlkalinityChemical): number {
  return ALKALINITY_CHEMICALS[chemical].equivalentWeight / EQUIVALENT_WEIGHT.CaCO3;
}

export interface AlkalinityDose {
  chemical: AlkalinityChemical;
  /** mg chemical per mg/L as CaCO3. */
  mgPerMgAlkalinity: number;
  /** Dose of the pure chemical, mg/L. */
  pureMgL: number;
  /** Dose of the commercial product at its purity, mg/L. */
  productMgL: number;
  /** Feed rates at the flow, when a flow is given. */
  pure: FeedRate | null;
  product: FeedRate | null;
}

/** Dose to raise alkalinity: mg/L = ΔAlk × EW/50.04, ÷ purity for the product; × flow for kg/d and lb/d [domain.md 8.5; 7.1]. */
export function alkalinityDose(input: {
  chemical: AlkalinityChemical;
  /** Increase wanted, mg/L as CaCO3. */
  alkalinityIncrease: number;
  /** Mass fraction of the product, %; 100 when pure. */
  purityPercent?: number;
  flow?: Flow | null;
}): AlkalinityDose {
  const mgPerMgAlkalinity = chemicalPerAlkalinity(input.chemical);
  const pureMgL = input.alkalinityIncrease * mgPerMgAlkalinity;
  const productMgL = pureMgL / ((input.purityPercent ?? 100) / 100);
  const flow = input.flow ?? null;
  return {
    chemical: input.chemical,
    mgPerMgAlkalinity,
    pureMgL,
    productMgL,
    pure: flow && feedRate(pureMgL, flow),
    product: flow && feedRate(productMgL, flow),
  };
}
