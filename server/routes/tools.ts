import {
  calculateAlkalinityDose,
  calculateCcpp,
  calculateDigester,
  calculateEndpointError,
  calculateNitrification,
  calculateTocRemoval,
} from '../../shared/chemistry/tools/service.js';
import { actorOf } from '../services/actor.js';
import { latestToolInputs } from '../services/toolInputs.js';
import type { RouteBuilder } from './registry.js';

/**
 * The tools' calculation routes (issue 9): the same shared functions the Tools pages run in
 * the browser. Each parses its body with the shared schema and throws an InputError (→ 400
 * with fields) for bad input. /calc/lsi stays in calc.ts.
 */
export function toolRoutes(r: RouteBuilder) {
  r.post('/calc/ccpp', 'calc.use', (req, res) => {
    res.json(calculateCcpp(req.body));
  });
  r.post('/calc/toc-removal', 'calc.use', (req, res) => {
    res.json(calculateTocRemoval(req.body));
  });
  r.post('/calc/nitrification', 'calc.use', (req, res) => {
    res.json(calculateNitrification(req.body));
  });
  r.post('/calc/alkalinity-dose', 'calc.use', (req, res) => {
    res.json(calculateAlkalinityDose(req.body));
  });
  r.post('/calc/digester', 'calc.use', (req, res) => {
    res.json(calculateDigester(req.body));
  });
  r.post('/calc/endpoint-error', 'calc.use', (req, res) => {
    res.json(calculateEndpointError(req.body));
  });
  // "Fill from latest results": reads approved results, so it needs the right to read samples.
  r.get('/tools/inputs', 'samples.read', async (req, res) => {
    res.json(await latestToolInputs(actorOf(req), req.query as Record<string, unknown>));
  });
}
