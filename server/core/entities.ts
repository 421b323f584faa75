import { SiteMemberEntity } from '../sites/site-member.entity';
import { SiteEntity } from '../sites/site.entity';
import { UserEntity } from '../users/user.entity';

/** Every TypeORM entity the DataSource knows. */
export const ENTITIES = [UserEntity, SiteEntity, SiteMemberEntity];
