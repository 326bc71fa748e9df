package org.roundtable.benchmark;

import java.lang.reflect.Method;
import java.util.Arrays;
import java.util.Locale;

/**
 * Runs one benchmark of the {@code benchmark} profile unless {@code -Dbench.only=name[,name...]} names others:
 * {@code Only <name> <main class> <arguments...>}. Every execution of the profile starts through it, so
 * {@code mvn -Pbenchmark verify -Dbench.only=pages} runs the pages benchmark alone. Names: statistics, reports,
 * audit-chain, evaluation, evaluate-cli, history, faults, submissions, pages, history-pages.
 */
public final class Only {

    private Only() {
    }

    public static void main(String[] args) throws Throwable {
        if (args.length < 2) {
            throw new IllegalArgumentException("usage: Only <name> <main class> [arguments]");
        }
        String only = System.getProperty("bench.only", "").strip().toLowerCase(Locale.ROOT);
        if (!only.isEmpty() && Arrays.stream(only.split(",")).map(String::strip).noneMatch(args[0]::equals)) {
            System.out.println("Benchmark " + args[0] + " skipped (bench.only=" + only + ")");
            return;
        }
        Method main = Class.forName(args[1]).getMethod("main", String[].class);
        try {
            main.invoke(null, (Object) Arrays.copyOfRange(args, 2, args.length));
        } catch (java.lang.reflect.InvocationTargetException e) {
            throw e.getCause();
        }
    }
}
