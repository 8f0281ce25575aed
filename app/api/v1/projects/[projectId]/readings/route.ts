// The readings list for rigs: the same handler as the web app's, answered for a bearer token.
export { GET } from '../../../../projects/[projectId]/readings/route';
