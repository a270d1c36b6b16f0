// The app's plain-words next step for a refused request (lib/errorMessages.ts).
import { ApiError } from '../../../lib/api';
import { explainError } from '../../../lib/errorMessages';

describe('explainError', () => {
  it('points at the marked field when a conflict names one (a taken name)', () => {
    const taken = new ApiError(409, 'conflict', 'A rule named "Washer rim" exists', [{ path: 'name', message: 'Already taken' }]);
    expect(explainError(taken)).toEqual({ message: 'A rule named "Washer rim" exists', nextStep: 'Change the marked field and try again.' });
  });

  it('does not speak of a marked field when the conflict is with the record’s state', () => {
    const inReview = new ApiError(409, 'conflict', 'Version 2 is still in-review; finish it before starting another');
    const { message, nextStep } = explainError(inReview);
    expect(message).toBe('Version 2 is still in-review; finish it before starting another');
    expect(nextStep).not.toMatch(/field/i);
    expect(nextStep).toMatch(/reload/i);
  });

  it('speaks of the page’s address, not of fields, when the id in the address is malformed', () => {
    const badLink = new ApiError(400, 'validation_failed', 'id: Not a valid id', [{ path: 'id', message: 'Not a valid id' }]);
    expect(explainError(badLink)).toEqual({ message: 'This page’s address is not valid.', nextStep: 'Go back to the list and open it from there.' });
  });

  it('keeps the other codes’ next steps and a generic one for what it does not know', () => {
    expect(explainError(new ApiError(422, 'validation_failed', 'Invalid', [{ path: 'sigma', message: 'Too small' }])).nextStep).toBe('Correct the marked fields and try again.');
    expect(explainError(new ApiError(418, 'something_new', 'Odd')).nextStep).toMatch(/^Try again/);
    expect(explainError(new Error('boom')).message).toBe('Something went wrong in the app.');
  });

  it('names the photo formats the decoder takes when an upload is of another kind (server/vision/decode.ts)', () => {
    expect(explainError(new ApiError(415, 'unsupported_media', 'Unsupported media type')).nextStep).toBe('Use a JPEG, PNG, TIFF or WebP photo and try again.');
  });
});
