import bcrypt from "bcryptjs";

/**
 * PIN hashes. A four-digit PIN has only 10 000 values, so no hashing cost
 * could stop someone who stole the hashes from trying them all; what guards a
 * PIN is the sign-in throttle (lib/auth/throttle.ts). Cost 10 (about a
 * quarter of the password cost's time) keeps enrolling a class of 30 to a
 * couple of seconds while still not storing the PIN itself.
 */
const PIN_COST = 10;

export async function hashPin(pin: string): Promise<string> {
  return bcrypt.hash(pin, PIN_COST);
}

export async function verifyPin(pin: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) {
    // Same time as a real check, so a missing student is not told apart by timing.
    await bcrypt.hash(pin, PIN_COST);
    return false;
  }
  return bcrypt.compare(pin, hash);
}
