// Problems under an editor field read in the field's own words. The shared schema words its messages
// for rule documents, naming a field by its code ("minFocus must be at least 0"); under a field
// labelled "Lowest focus" the message says "Lowest focus must be at least 0".

/** The message with a leading document code (a lower-case first word before "must") replaced by the field's label. */
export function fieldMessage(message: string | undefined, label: string): string | undefined {
  if (!message) return message;
  const coded = /^[a-z][A-Za-z]*(?:\.[a-z][A-Za-z]*)* (must .*)$/.exec(message);
  return coded ? `${label} ${coded[1]}` : sentence(message);
}

/** The message as a sentence: a capital first letter ("a gauge needs a name" → "A gauge needs a name"). */
export function sentence(message: string): string {
  return message.charAt(0).toUpperCase() + message.slice(1);
}
