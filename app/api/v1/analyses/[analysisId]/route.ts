export { GET } from '../../../analyses/[analysisId]/route';
