/**
 * Where in the user's input a problem was found. Every field is optional: a
 * parser fills in what it knows (a file name, a 1-based row and column, a
 * column header or a request field name).
 */
export interface InputLocation {
  file?: string;
  row?: number;
  column?: number | string;
  field?: string;
}

/**
 * Thrown by the engine for input it cannot use. The message already says what
 * and where; `location` carries the same facts for programs (the API turns it
 * into `{ error, fields }`, the CLI prints `file:row:column`).
 */
export class EngineInputError extends Error {
  readonly location: InputLocation;

  constructor(message: string, location: InputLocation = {}) {
    super(EngineInputError.describe(message, location));
    this.name = 'EngineInputError';
    this.location = location;
  }

  /** `file, row 3, column "vout_v": message`, leaving out what is unknown. */
  static describe(message: string, location: InputLocation): string {
    const where: string[] = [];
    if (location.file) where.push(location.file);
    if (location.row !== undefined) where.push(`row ${location.row}`);
    if (location.column !== undefined) {
      where.push(typeof location.column === 'number' ? `column ${location.column}` : `column "${location.column}"`);
    }
    if (location.field) where.push(`field "${location.field}"`);
    return where.length > 0 ? `${where.join(', ')}: ${message}` : message;
  }
}
