import { cellQuerySchema } from '../cell.ts';
import { errors, ok, queryParameters } from './parts.ts';

/** Operations of the Cells tag. */
export const cellsPaths = {
  '/cell': {
    get: {
      operationId: 'cellFromCollection',
      tags: ['Cells'],
      summary:
        'The cell voltages an electrode pair can take in one electrolyte, from the windows you may read',
      description:
        'The anodic limit of the positive material and the cathodic limit of the negative material are the medians of the records at the common criterion on the chosen scale; ' +
        'the rest potential and specific capacitances are entered, or read from the capacitive cycles of window-opening runs. ' +
        'The answer gives the equal-mass and charge-balanced cell voltages with every step of the arithmetic, a margin, the energy against a baseline, ' +
        'and the records behind each number (used or left out with the reason, evidence levels, disagreeing records). ' +
        '`result` is null and `refusal` says why when the records cannot make a cell.',
      parameters: queryParameters(cellQuerySchema),
      responses: { '200': ok('Cell', 'The cell, its arithmetic and its evidence'), ...errors(400) },
    },
  },
  '/cell/choices': {
    get: {
      operationId: 'cellChoices',
      tags: ['Cells'],
      summary:
        'The electrolytes (exact compositions) with three-electrode windows you may read, each with its electrode materials and its key for GET /cell',
      responses: { '200': ok('CellChoices', 'Electrolytes with their keys and materials') },
    },
  },
};
