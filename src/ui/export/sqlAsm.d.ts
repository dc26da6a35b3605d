// sql.js's asm.js build: the same SQLite as the wasm build, in plain JavaScript, so it
// runs under the app's script policy, which does not allow compiling WebAssembly.
declare module 'sql.js/dist/sql-asm.js' {
  import initSqlJs from 'sql.js';
  export default initSqlJs;
}
