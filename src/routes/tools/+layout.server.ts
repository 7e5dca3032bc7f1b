import type { LayoutServerLoad } from './$types';
import { LIVE_SCRIPT_PATH } from '$lib/server/tools-live';

// The bench tools are GET forms computed on the server (results in the address): no framework in the
// browser. `ToolPage` loads the small live-update script from `liveScript` (README, "Speed").
export const csr = false;

export const load: LayoutServerLoad = () => ({ liveScript: LIVE_SCRIPT_PATH });
