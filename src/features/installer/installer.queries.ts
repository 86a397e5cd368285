import { queryOptions } from '@tanstack/react-query';
import { fetchInstallerRigs, fetchRigGrants } from './installer.api';

/** Query keys of installer grants. */
export const grantKeys = {
  all: ['grants'] as const,
  rig: (rigId: string) => [...grantKeys.all, 'rig', rigId] as const,
  mine: () => [...grantKeys.all, 'mine'] as const,
};

export const rigGrantsQuery = (rigId: string) => queryOptions({ queryKey: grantKeys.rig(rigId), queryFn: () => fetchRigGrants(rigId) });

export const installerRigsQuery = () => queryOptions({ queryKey: grantKeys.mine(), queryFn: fetchInstallerRigs });
