/** Bad input to a fit or a curve sample; `field` names the offending input for the UI and API. */
export class FitInputError extends Error {
  readonly field: string;

  constructor(message: string, field: string) {
    super(message);
    this.name = "FitInputError";
    this.field = field;
  }
}
