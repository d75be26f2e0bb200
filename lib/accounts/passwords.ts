// Password hashing with bcrypt (bcryptjs: pure JavaScript, no native build).
import bcrypt from 'bcryptjs';

const COST = 10;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export function passwordMatches(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

// Compared against when the e-mail is unknown, so that an unknown address takes as long to
// refuse as a wrong password and the answer time does not reveal who has an account.
const UNKNOWN_USER_HASH = bcrypt.hashSync('no account has this password', COST);

export function spendComparisonTime(password: string): Promise<boolean> {
  return bcrypt.compare(password, UNKNOWN_USER_HASH);
}
