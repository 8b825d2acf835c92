import type { DateOrder } from './date-text.js';
import type { DecimalMark } from './number-text.js';

/** What the user states about how the cells are written; anything left out is detected or asked. */
export interface ImportSettings {
  decimal?: DecimalMark;
  dateOrder?: DateOrder;
  /** The inspection unit in the user's words ("one board", "50 m² of cloth"), shown on every output. */
  inspectionUnit?: string;
}
