import type { Role } from '../schema';

/** The invented shop of the demo. Passwords are printed by `npm start`; demo data only. */
export const demoChambers = [
  { name: 'Bay 1 e-beam', process: 'electron-beam evaporation', description: 'Box coater with a four-pocket e-beam gun and a quartz-crystal monitor.' },
  { name: 'Bay 2 IAD', process: 'ion-assisted e-beam deposition', description: 'E-beam coater with an end-Hall ion source for dense oxide layers.' },
  { name: 'Bay 3 sputter', process: 'magnetron sputtering', description: 'Reactive magnetron sputter line with a rotating drum.' },
];

export const demoUsers: { name: string; email: string; role: Role; password: string }[] = [
  { name: 'Tamsin Reyes', email: 'tamsin@larkspur.example', role: 'operator', password: 'larkspur-operator-1' },
  { name: 'Idris Vantongeren', email: 'idris@larkspur.example', role: 'engineer', password: 'larkspur-engineer-1' },
  { name: 'Wren Halloway', email: 'wren@larkspur.example', role: 'supervisor', password: 'larkspur-supervisor-1' },
  { name: 'Bodhi Castellan', email: 'bodhi@larkspur.example', role: 'admin', password: 'larkspur-admin-1' },
];

