import { InputError } from '../../core/errors.js';

/** A SEG-2 file that cannot be read as the standard describes: names the file, trace and field. */
export class Seg2Error extends InputError {
  constructor(file: string, trace: number | undefined, field: string, message: string) {
    super({ file, trace, column: field }, message);
    this.name = 'Seg2Error';
  }
}
