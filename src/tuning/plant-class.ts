import type { DesignModel, PlantClass } from './types.js';

/**
 * The plant class of a design model: 2 integrators → double-integrating, 1 → integrating,
 * none with two or more lags → second-order, otherwise self-regulating (FOPDT).
 */
export function plantClassOf(model: DesignModel): PlantClass {
  if (model.integrators === 2) return 'double-integrating';
  if (model.integrators === 1) return 'integrating';
  return model.lags_s.length >= 2 ? 'second-order' : 'self-regulating';
}

/** Human wording of a plant class with its formula, for messages. */
export function describePlantClass(plantClass: PlantClass): string {
  switch (plantClass) {
    case 'self-regulating':
      return 'self-regulating first order plus dead time K·e^(−θs)/(τs + 1)';
    case 'second-order':
      return 'self-regulating second order plus dead time K·e^(−θs)/((τ1·s + 1)(τ2·s + 1))';
    case 'integrating':
      return "integrating k'·e^(−θs)/s";
    case 'double-integrating':
      return "double-integrating k''·e^(−θs)/s²";
  }
}
