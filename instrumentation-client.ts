// Runs in the browser before the app's own code (Next.js loads it ahead of hydration).
import './lib/http/no-eval';
