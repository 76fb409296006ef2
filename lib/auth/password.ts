import bcrypt from "bcryptjs";

// Cost 12 takes about a quarter of a second here: slow for an attacker,
// quick enough for a person signing in.
const COST = 12;

export async function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export async function verifyPassword(password: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) {
    // Spend the same time as a real check so a missing account is not
    // distinguishable by timing.
    await bcrypt.hash(password, COST);
    return false;
  }
  return bcrypt.compare(password, hash);
}
