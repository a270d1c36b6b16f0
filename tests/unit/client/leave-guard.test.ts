// The guard that asks before a navigation drops unsaved work: nothing is asked when nothing would be
// lost; a waiting navigation runs only once the person agrees, and never when they stay.
import { cancelLeave, confirmLeave, guardLinkPress, leaveGuardState, requestLeave, setLeaveGuard, subscribeLeaveGuard } from '../../../lib/leaveGuard';

afterEach(() => setLeaveGuard(null));

test('with nothing unsaved a navigation goes at once and nobody is asked', () => {
  const go = jest.fn();
  requestLeave(go);
  expect(go).toHaveBeenCalledTimes(1);
  expect(leaveGuardState()).toEqual({ reason: null, asking: false });
});

test('with unsaved work the navigation waits for the answer; staying drops it and keeps the guard', () => {
  setLeaveGuard('Version 2 (draft) has changes that are not saved.');
  const go = jest.fn();
  requestLeave(go);
  expect(go).not.toHaveBeenCalled();
  expect(leaveGuardState()).toEqual({ reason: 'Version 2 (draft) has changes that are not saved.', asking: true });
  cancelLeave();
  expect(go).not.toHaveBeenCalled();
  expect(leaveGuardState()).toEqual({ reason: 'Version 2 (draft) has changes that are not saved.', asking: false });
  // Agreeing later does not run the dropped navigation.
  confirmLeave();
  expect(go).not.toHaveBeenCalled();
});

test('agreeing lifts the guard before the navigation runs, so that it is not asked about again', () => {
  setLeaveGuard('Version 2 (draft) has changes that are not saved.');
  const seenByNavigation: string[] = [];
  requestLeave(() => {
    // A navigation that itself asks the guard (a removal the router checks) finds nothing to ask.
    requestLeave(() => seenByNavigation.push('went'));
  });
  confirmLeave();
  expect(seenByNavigation).toEqual(['went']);
  expect(leaveGuardState()).toEqual({ reason: null, asking: false });
});

test('only the last navigation asked for runs', () => {
  setLeaveGuard('unsaved');
  const first = jest.fn();
  const second = jest.fn();
  requestLeave(first);
  requestLeave(second);
  confirmLeave();
  expect(first).not.toHaveBeenCalled();
  expect(second).toHaveBeenCalledTimes(1);
});

test('the page saving (the guard cleared) closes an open question without navigating', () => {
  setLeaveGuard('unsaved');
  const go = jest.fn();
  requestLeave(go);
  setLeaveGuard(null);
  expect(leaveGuardState()).toEqual({ reason: null, asking: false });
  confirmLeave();
  expect(go).not.toHaveBeenCalled();
});

test('a link is stopped only when something would be lost', () => {
  const event = { preventDefault: jest.fn() };
  const go = jest.fn();
  guardLinkPress(event, go);
  expect(event.preventDefault).not.toHaveBeenCalled();
  expect(go).not.toHaveBeenCalled(); // the link navigates by itself

  setLeaveGuard('unsaved');
  guardLinkPress(event, go);
  expect(event.preventDefault).toHaveBeenCalledTimes(1);
  expect(go).not.toHaveBeenCalled();
  confirmLeave();
  expect(go).toHaveBeenCalledTimes(1);
});

test('listeners hear every change and stop hearing once unsubscribed', () => {
  const heard = jest.fn();
  const stop = subscribeLeaveGuard(heard);
  setLeaveGuard('unsaved');
  requestLeave(() => undefined);
  cancelLeave();
  expect(heard).toHaveBeenCalledTimes(3);
  stop();
  setLeaveGuard(null);
  expect(heard).toHaveBeenCalledTimes(3);
});
