// The rig API: the same handlers as the web app's, reached with a bearer token.
export { POST } from '../../captures/route';
