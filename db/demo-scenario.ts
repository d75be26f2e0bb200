// The invented people of the demo. The seed creates them, `npm run demo` prints them, and the
// README lists them; everything here is made up.
import type { Role } from '../lib/accounts/roles';

export const DEMO_STUDIOS = [
  { slug: 'quillmoor', name: 'Quillmoor Coatwrights' },
  { slug: 'gorse-hill', name: 'Gorse Hill Games' },
] as const;

export type DemoAccount = {
  email: string;
  password: string;
  displayName: string;
  roles: Role[];
  studio: (typeof DEMO_STUDIOS)[number]['slug'];
  about: string;
};

export const DEMO_ACCOUNTS: DemoAccount[] = [
  {
    email: 'wren@quillmoor.example',
    password: 'whorl-on-the-crown',
    displayName: 'Wren Abernathy',
    roles: ['groomer'],
    studio: 'quillmoor',
    about: 'lead groomer at Quillmoor; grooms the studio’s otters and sells presets',
  },
  {
    email: 'tomasz@gorsehill.example',
    password: 'badger-coat-please',
    displayName: 'Tomasz Brackenridge',
    roles: ['buyer'],
    studio: 'gorse-hill',
    about: 'character artist at Gorse Hill Games; buys presets for a game cast',
  },
  {
    email: 'maud@quillmoor.example',
    password: 'keeper-of-the-keys',
    displayName: 'Maud Pennyweather',
    roles: ['admin'],
    studio: 'quillmoor',
    about: 'runs the market: approves listings, handles refunds and roles',
  },
];
