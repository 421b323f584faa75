import express from 'express';
import { loadMailConfig } from '../mail/mail-config';
import { DEFAULT_DB_POOL_SIZE, DEFAULT_PULL_SLOTS, loadConfig } from './config';

const DB = { DATABASE_URL: 'postgres://u:p@127.0.0.1:1/x_test' };
const load = (env: NodeJS.ProcessEnv) => loadConfig({}, { ...DB, ...env });

describe('server configuration', () => {
  describe('DB_POOL_SIZE, the PostgreSQL connections one process may hold', () => {
    it('when unset, then the default; when set, then that number', () => {
      expect(load({}).dbPoolSize).toBe(DEFAULT_DB_POOL_SIZE);
      expect(load({ DB_POOL_SIZE: '12' }).dbPoolSize).toBe(12);
    });

    it('when not a whole number of at least 2, then the server refuses to start and names the variable', () => {
      for (const bad of ['0', '1', '2.5', 'many', '-4']) expect(() => load({ DB_POOL_SIZE: bad })).toThrow(/DB_POOL_SIZE must be/);
    });
  });

  describe('PULL_SLOTS, the pulls one process serves at once', () => {
    it('when unset, then the default (one); when set, then that number', () => {
      expect(load({}).pullSlots).toBe(DEFAULT_PULL_SLOTS);
      expect(DEFAULT_PULL_SLOTS).toBe(1);
      expect(load({ PULL_SLOTS: '3' }).pullSlots).toBe(3);
    });

    it('when not a whole number of at least 1, then the server refuses to start and names the variable', () => {
      for (const bad of ['0', '1.5', 'few', '-1'])
        expect(() => load({ PULL_SLOTS: bad })).toThrow(/PULL_SLOTS must be a whole number of at least 1/);
    });
  });

  describe('APP_ORIGIN, the one origin of links in mail and on tags', () => {
    it('when APP_ORIGIN is set, then links use it without a trailing slash', () => {
      expect(load({ APP_ORIGIN: 'https://fluxwalk.example.org/' }).appOrigin).toBe('https://fluxwalk.example.org');
    });

    it("when APP_ORIGIN is unset, then links use the server's own configured address (loopback for a wildcard bind)", () => {
      expect(load({ PORT: '8123' }).appOrigin).toBe('http://127.0.0.1:8123');
      expect(load({ HOST: '0.0.0.0', PORT: '9000' }).appOrigin).toBe('http://127.0.0.1:9000');
      expect(load({ HOST: 'fw.lan', PORT: '80' }).appOrigin).toBe('http://fw.lan:80');
    });

    it('when NODE_ENV=production and APP_ORIGIN is missing, then the server refuses to start and says what to set', () => {
      expect(() => load({ NODE_ENV: 'production' })).toThrow(/APP_ORIGIN is not set.*NODE_ENV=production.*https:\/\//);
      expect(load({ NODE_ENV: 'production', APP_ORIGIN: 'https://fw.example.org' }).appOrigin).toBe('https://fw.example.org');
    });

    it('when APP_ORIGIN is not a bare http(s) origin, then the message names the expected form', () => {
      for (const bad of [
        'fluxwalk.example.org',
        'ftp://fw.example.org',
        'https://fw.example.org/app',
        'https://user:pw@fw.example.org',
        'https://fw.example.org?x=1',
      ]) {
        expect(() => load({ APP_ORIGIN: bad })).toThrow(/APP_ORIGIN must be an origin like https:\/\/fluxwalk\.example\.org/);
      }
    });
  });

  describe('TRUST_PROXY, read as Express reads its "trust proxy" setting', () => {
    it.each([
      ['', false],
      ['false', false],
      ['FALSE', false],
      ['true', true],
      ['1', 1],
      ['2', 2],
      [' 3 ', 3],
      ['loopback', ['loopback']],
      ['10.0.0.1, 10.0.0.2', ['10.0.0.1', '10.0.0.2']],
      ['192.168.0.0/16,fc00::/7', ['192.168.0.0/16', 'fc00::/7']],
      ['loopback, uniquelocal', ['loopback', 'uniquelocal']],
    ])('when TRUST_PROXY is "%s", then the setting is %p', (raw, expected) => {
      expect(load({ TRUST_PROXY: raw }).trustProxy).toEqual(expected);
    });

    it("when TRUST_PROXY is a hop count, then Express counts hops (the README's TRUST_PROXY=1 trusts the proxy in front)", () => {
      const app = express();
      app.set('trust proxy', load({ TRUST_PROXY: '1' }).trustProxy);
      const trust = app.get('trust proxy fn') as (addr: string, i: number) => boolean;
      expect([trust('127.0.0.1', 0), trust('203.0.113.9', 1)]).toEqual([true, false]);
    });

    it('when TRUST_PROXY holds something that is neither, then start-up fails naming the accepted forms', () => {
      for (const bad of ['yes', '-1', '1.5', '10.0.0.300', 'proxy.example.org', '10.0.0.0/99', '10.0.0.1,,']) {
        expect(() => load({ TRUST_PROXY: bad })).toThrow(/TRUST_PROXY.*true, false, a hop count.*loopback/);
      }
    });
  });

  it('when sign-in limits come from the environment, then both the per-account and the per-address limit are read', () => {
    const c = load({ LOGIN_MAX_FAILURES: '4', LOGIN_MAX_FAILURES_PER_ADDRESS: '30', LOGIN_WINDOW_MS: '60000' });
    expect([c.loginMaxFailures, c.loginMaxFailuresPerAddress, c.loginWindowMs]).toEqual([4, 30, 60000]);
    expect(load({}).loginMaxFailuresPerAddress).toBe(100);
  });

  it('when a number setting is not a number, then start-up fails naming it; empty takes the default', () => {
    expect(() => load({ PORT: 'eighty' })).toThrow('PORT must be a number, got "eighty"');
    expect(load({ PORT: '', LOGIN_WINDOW_MS: '' })).toMatchObject({ port: 8080, loginWindowMs: 15 * 60 * 1000 });
  });

  it('when mail settings are empty, then mail has no server and the default sender; a bad SMTP_PORT is named', () => {
    expect(loadMailConfig({ SMTP_HOST: '', SMTP_PORT: '', MAIL_FROM: '' })).toEqual({
      host: null,
      port: 587,
      user: null,
      pass: null,
      from: 'Fluxwalk <fluxwalk@localhost>',
      appOrigin: 'http://127.0.0.1:8080',
    });
    expect(loadMailConfig({ SMTP_HOST: 'mail.lan', SMTP_PORT: '2525' })).toMatchObject({ host: 'mail.lan', port: 2525 });
    expect(() => loadMailConfig({ SMTP_PORT: '0' })).toThrow('SMTP_PORT must be a port number, got "0"');
  });
});
