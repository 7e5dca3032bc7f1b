// Loaded with `node --import` into the app process that `npm start` spawns: when the process that
// started it disappears (even killed with SIGKILL, which it cannot catch), the app stops too.
const parentAtStart = process.ppid;
setInterval(() => {
	if (process.ppid !== parentAtStart) process.kill(process.pid, 'SIGTERM');
}, 1000).unref();
