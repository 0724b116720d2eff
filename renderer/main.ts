import './zod-config.ts';
import { mount } from 'svelte';
import App from './App.svelte';
import './styles.css';

const target = document.getElementById('app');
if (!target) throw new Error('index.html lost its #app element');
mount(App, { target });
