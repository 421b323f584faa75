import { Foundation1764644400000 } from './1764644400000-foundation';
import { FieldData1764651600000 } from './1764651600000-field-data';
import { ProgressIndexes1764658800000 } from './1764658800000-progress-indexes';
import { BenchReview1764662400000 } from './1764662400000-bench-review';
import { ClosureFillfactor1764662460000 } from './1764662460000-closure-fillfactor';
import { AccountsMail1764673200000 } from './1764673200000-accounts-mail';
import { ResultExports1764676800000 } from './1764676800000-result-exports';
import { ClosureProgressIndex1764680400000 } from './1764680400000-closure-progress-index';
import { FluxBasisPrecision1764688000000 } from './1764688000000-flux-basis-precision';
import { RawChangeHistory1764691200000 } from './1764691200000-raw-change-history';
import { SyncOpPerUser1764694800000 } from './1764694800000-sync-op-per-user';
import { AnalyzerCalibrations1764698400000 } from './1764698400000-analyzer-calibrations';
import { ChamberAirTemperature1764700000000 } from './1764700000000-chamber-air-temperature';
import { RecomputeAfterEngineUpdate1764703600000 } from './1764703600000-recompute-after-engine-update';
import { PointExclusions1796425800000 } from './20261204231000-point-exclusions';
import { ClosureMove1796426400000 } from './20261204232000-closure-move';
import { ProbeReplicates1796426460000 } from './1796426460000-probe-replicates';
import { VisitProgress1796426700000 } from './20261204232500-visit-progress';
import { LayoutChangeIndex1796427000000 } from './20261204233000-layout-change-index';
import { TempDepthTolerance1796427060000 } from './1796427060000-temp-depth-tolerance';
import { VisitProgressRange1796435400000 } from './20261205015000-visit-progress-range';

/** Every migration, oldest first. Add new ones at the end (see DEVELOPERS.md). */
export const MIGRATIONS = [
  Foundation1764644400000,
  FieldData1764651600000,
  ProgressIndexes1764658800000,
  BenchReview1764662400000,
  ClosureFillfactor1764662460000,
  AccountsMail1764673200000,
  ResultExports1764676800000,
  ClosureProgressIndex1764680400000,
  FluxBasisPrecision1764688000000,
  RawChangeHistory1764691200000,
  SyncOpPerUser1764694800000,
  AnalyzerCalibrations1764698400000,
  ChamberAirTemperature1764700000000,
  RecomputeAfterEngineUpdate1764703600000,
  PointExclusions1796425800000,
  ClosureMove1796426400000,
  ProbeReplicates1796426460000,
  VisitProgress1796426700000,
  LayoutChangeIndex1796427000000,
  TempDepthTolerance1796427060000,
  VisitProgressRange1796435400000,
];
