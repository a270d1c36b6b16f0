// A reference set's counts read the same in the preview's and the trial's pickers, and add up to the total.
import { describeSetCounts } from '../../../components/references/setCounts';

test('the parts add up to the total that is named first', () => {
  expect(describeSetCounts({ total: 60, good: 34, defective: 20, retake: 6, unlabelled: 0 })).toBe('60 photos: 34 good, 20 defective, 6 retake');
  expect(describeSetCounts({ total: 4, good: 0, defective: 3, retake: 0, unlabelled: 1 })).toBe('4 photos: 0 good, 3 defective, 1 unlabelled');
  expect(describeSetCounts({ total: 1, good: 1, defective: 0, retake: 0, unlabelled: 0 })).toBe('1 photo: 1 good, 0 defective');
  expect(describeSetCounts({ total: 0, good: 0, defective: 0, retake: 0, unlabelled: 0 })).toBe('0 photos: 0 good, 0 defective');
});
