import bcrypt from 'bcryptjs';

// bcrypt (Provos & Mazières, "A Future-Adaptable Password Scheme", USENIX 1999); cost 10 is common practice.
const COST = 10;
// Compared against when the user does not exist, so an unknown name costs as long as a wrong password.
const DUMMY_HASH = bcrypt.hashSync('kernwright-no-such-user', COST);

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export function verifyPassword(password: string, hash: string | null): Promise<boolean> {
  return bcrypt.compare(password, hash ?? DUMMY_HASH).then((ok) => ok && hash !== null);
}
