/** The fixture people as a separately started service signs them in (the fixtures' emails and password). */
import { FIXTURE_EMAILS, FIXTURE_PASSWORD } from '../support/fixtures';
import type { FixtureUser } from './service-process';

export function fixtureUser(id: string): FixtureUser {
  const email = FIXTURE_EMAILS[id];
  if (!email) throw new Error(`No fixture person ${id}`);
  return { id, email, password: FIXTURE_PASSWORD };
}
