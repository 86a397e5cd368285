import { env } from './env';
import { limitKey } from './rate-limit';

// Invitations and installer shares send e-mail to an address someone typed: per-crew, per-address
// and per-owner hourly limits keep the app from being used to flood a mailbox.

const HOUR = 60 * 60;

/** Counts one invitation e-mail (new or resent) against the crew's and the address's hourly limits; 429 past either. */
export async function limitInvitations(crewId: string, email: string): Promise<void> {
  await limitKey(
    'invite-crew',
    crewId,
    env.INVITE_CREW_HOURLY,
    HOUR,
    `This crew has sent ${env.INVITE_CREW_HOURLY} invitations in the last hour.`,
  );
  await limitKey(
    'invite-address',
    email.trim().toLowerCase(),
    env.INVITE_ADDRESS_HOURLY,
    HOUR,
    `This address was invited ${env.INVITE_ADDRESS_HOURLY} times in the last hour.`,
    'email',
  );
}

/** Counts one rig share against the owner's hourly limit; 429 past it. */
export async function limitGrants(userId: string): Promise<void> {
  await limitKey('grant-owner', userId, env.GRANT_HOURLY, HOUR, `You have shared rigs ${env.GRANT_HOURLY} times in the last hour.`);
}
