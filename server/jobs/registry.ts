/**
 * Every job queue and its worker, imported once by whoever runs workers (the server process by
 * default, or a separate worker process past one machine). Each feature adds its import here.
 */
import '../mail/worker'
import '../services/measurements'
