// The preload of the sandboxed renderer: it exposes exactly the bridge calls of
// src/platform/channels.ts and nothing of ipcRenderer itself. Built to one CommonJS
// file (dist-electron/preload.cjs), since a sandboxed preload can require only 'electron'.

import { contextBridge, ipcRenderer } from 'electron';
import { BRIDGE_GLOBAL, CHANNELS, type BridgeApi } from '../src/platform/channels.ts';

const bridge: BridgeApi = {
  pickFiles: (request) => ipcRenderer.invoke(CHANNELS.pickFiles, request),
  readRange: (request) => ipcRenderer.invoke(CHANNELS.readRange, request),
  saveFile: (request) => ipcRenderer.invoke(CHANNELS.saveFile, request),
  openDemoFile: (request) => ipcRenderer.invoke(CHANNELS.openDemoFile, request),
  appFileWrite: (request) => ipcRenderer.invoke(CHANNELS.appFileWrite, request),
  appFileRead: (request) => ipcRenderer.invoke(CHANNELS.appFileRead, request),
  appFileList: (request) => ipcRenderer.invoke(CHANNELS.appFileList, request),
  appFileRemove: (request) => ipcRenderer.invoke(CHANNELS.appFileRemove, request),
  rememberImagery: (request) => ipcRenderer.invoke(CHANNELS.rememberImagery, request),
  recallImagery: (request) => ipcRenderer.invoke(CHANNELS.recallImagery, request),
};

contextBridge.exposeInMainWorld(BRIDGE_GLOBAL, bridge);
