import { createLocalStudyModel } from '../../../renderer/study/study-model.ts';
import { studyModelContract } from './study-model-contract.ts';

studyModelContract('field-table model', createLocalStudyModel);
