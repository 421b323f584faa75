import { ENTITY_DEFS } from '../records/entity-registry';
import { SiteMemberEntity } from '../sites/site-member.entity';
import { UserEntity } from '../users/user.entity';

/** Every TypeORM entity the DataSource knows: accounts plus every record type of the registry. */
/** Every record type of the registry is an entity class (decorated), never a schema object or a name. */
type EntityClass = new (...args: never[]) => object;
export const ENTITIES: EntityClass[] = [UserEntity, SiteMemberEntity, ...Object.values(ENTITY_DEFS).map((d) => d.target as EntityClass)];
