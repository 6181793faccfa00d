/**
 * A domain rule's refusal of one field's value ("that lab already has a
 * shipment"): models throw it, and the action shows the message beside the
 * named field with what was typed kept.
 */
export class FieldRefusal extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}
