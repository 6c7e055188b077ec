import { useOutletContext } from 'react-router-dom';
import type { SessionUser } from '../../shared/schemas/auth';

/** The signed-in user, as the app shell hands it to every screen inside it. */
export const useMe = () => useOutletContext<SessionUser>();
