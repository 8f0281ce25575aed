// The trend for scripts and dashboards: the same handler as the web app's, answered for a bearer token.
export { GET } from '../../../../projects/[projectId]/trend/route';
