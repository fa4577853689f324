import { calculateAcidity, calculateAlkalinity, calculateCurve, calculateLsi, calculateSpeciation } from '../../shared/chemistry/service.js';
import type { RouteBuilder } from './registry.js';

/**
 * The public calculation API (product.md): the same shared engine the browser uses for
 * live feedback. Each function parses its body with the shared schema and throws an
 * InputError (→ 400 with fields) for bad input.
 */
export function calcRoutes(r: RouteBuilder) {
  r.post('/calc/alkalinity', 'calc.use', (req, res) => {
    res.json(calculateAlkalinity(req.body));
  });
  r.post('/calc/acidity', 'calc.use', (req, res) => {
    res.json(calculateAcidity(req.body));
  });
  r.post('/calc/speciation', 'calc.use', (req, res) => {
    res.json(calculateSpeciation(req.body));
  });
  r.post('/calc/curve', 'calc.use', (req, res) => {
    res.json(calculateCurve(req.body));
  });
  r.post('/calc/lsi', 'calc.use', (req, res) => {
    res.json(calculateLsi(req.body));
  });
}
