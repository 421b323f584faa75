import { ENTITY_DEFS } from '../records/entity-registry';
import { SiteMemberEntity } from '../sites/site-member.entity';
import { UserEntity } from '../users/user.entity';

/** Every TypeORM entity the DataSource knows: accounts plus every record type of the registry. */
export const ENTITIES = [UserEntity, SiteMemberEntity, ...Object.values(ENTITY_DEFS).map((d) => d.target as Function)];
