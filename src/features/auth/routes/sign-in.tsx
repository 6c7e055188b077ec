import { useState, type FormEvent } from 'react';
import { Navigate, useNavigate } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { ROLE_HOME } from '../../../../shared/roles';
import { LoginSchema } from '../../../../shared/schemas/auth';
import { authQueries, useLogin } from '../api';
import { AuthFrame } from '../components/auth-frame';

export function SignInRoute() {
  const setup = useQuery(authQueries.setup());
  const login = useLogin();
  const navigate = useNavigate();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});
  if (setup.data?.needed) return <Navigate to="/setup" replace />;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = LoginSchema.safeParse({ email, password });
    if (!parsed.success) {
      setFieldErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
      return;
    }
    setFieldErrors({});
    login.mutate(parsed.data, { onSuccess: (r) => navigate(ROLE_HOME[r.user.role], { replace: true }) });
  };
  const err = login.error instanceof ApiError ? login.error : null;
  return (
    <AuthFrame title="Sign in">
      <form onSubmit={submit} noValidate className="flex flex-col gap-4">
        <TextField label="E-mail" type="email" autoComplete="username" value={email} onChange={(e) => setEmail(e.target.value)} error={fieldErrors.email ?? err?.field('email')} />
        <TextField label="Password" type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.target.value)} error={fieldErrors.password} />
        {err && !err.details.length && (
          <p role="alert" className="rounded-card bg-state-stop-soft p-3 font-medium text-state-stop">
            {err.message}
          </p>
        )}
        <Button type="submit" disabled={login.isPending}>
          {login.isPending ? 'Signing in…' : 'Sign in'}
        </Button>
      </form>
    </AuthFrame>
  );
}
