/** An input of an uncertainty study that cannot be used: the field, the value given and the fix. */
export class UncertaintyInputError extends RangeError {
  constructor(
    readonly field: string,
    readonly value: unknown,
    readonly fix: string,
  ) {
    super(`${field}: ${short(value)} ${fix}`);
    this.name = 'UncertaintyInputError';
  }
}

function short(value: unknown): string {
  const text = JSON.stringify(value) ?? String(value);
  return text.length > 200 ? `${text.slice(0, 197)}…` : text;
}
