import { mount } from 'svelte';
import App from './App.svelte';
import './theme.css';

performance.mark('fellfield:script');
mount(App, { target: document.getElementById('app')! });
