// The editor's field messages name the field by its label, not by the rule document's code (our own
// wording rule; the document's messages are checked in tests/unit/rules).
import { fieldMessage } from '../../../components/rules/fieldMessage';

test('a document code before "must" becomes the field label', () => {
  expect(fieldMessage('minFocus must be at least 0', 'Lowest focus')).toBe('Lowest focus must be at least 0');
  expect(fieldMessage('maxClipped must be between 0 and 1', 'Largest clipped share')).toBe('Largest clipped share must be between 0 and 1');
  expect(fieldMessage('x must be between 0 and 1', 'Left (x)')).toBe('Left (x) must be between 0 and 1');
  expect(fieldMessage('sigma must be between 0.3 and 10', 'Sigma')).toBe('Sigma must be between 0.3 and 10');
});

test('messages already in the screen’s words stay, as sentences', () => {
  expect(fieldMessage('Lowest allowed must not be above highest allowed.', 'Lowest allowed')).toBe('Lowest allowed must not be above highest allowed.');
  expect(fieldMessage('a gauge needs a name', 'Gauge name')).toBe('A gauge needs a name');
  expect(fieldMessage(undefined, 'Sigma')).toBeUndefined();
});
